import type { Analyte, TestMethod } from '@shared/schemas/water-tests.schema';

/**
 * "Card steps": the colour blocks printed on a kit's comparison card, so a hand can tap the block the
 * sample matches instead of typing. Gillwise's own step sets (product decision, typical of the kits on
 * the market); a kit with other steps is typed in the reading field.
 */
const steps: Partial<Record<Analyte, Partial<Record<TestMethod, readonly number[]>>>> = {
  total_ammonia: {
    salicylate: [0, 0.25, 0.5, 1, 2, 4, 8],
    nessler: [0, 0.2, 0.5, 1, 2, 3, 5],
    strip: [0, 0.5, 1, 3, 6],
  },
  nitrite: {
    colorimetric: [0, 0.25, 0.5, 1, 2, 5],
    strip: [0, 0.15, 0.3, 1, 1.5, 3],
  },
  nitrate: {
    colorimetric: [0, 5, 10, 20, 40, 80, 160],
    strip: [0, 10, 25, 50, 100, 250],
  },
  alkalinity: { strip: [0, 40, 80, 120, 180, 240] },
  hardness: { strip: [0, 25, 50, 120, 250, 425] },
  chloride: { strip: [0, 50, 100, 200, 500, 1000] },
  ph: {
    colorimetric: [6, 6.5, 7, 7.5, 8, 8.5, 9],
    strip: [6, 6.5, 7, 7.5, 8, 8.5, 9],
  },
};

export function cardSteps(analyte: Analyte, method: TestMethod): readonly number[] {
  return steps[analyte]?.[method] ?? [];
}

/** The method a hand most likely has in the kit box for each analyte. */
export const defaultMethod: Record<Analyte, TestMethod> = {
  total_ammonia: 'salicylate',
  nitrite: 'colorimetric',
  nitrate: 'colorimetric',
  alkalinity: 'titration',
  chloride: 'titration',
  hardness: 'titration',
  ph: 'meter',
  temperature: 'meter',
  dissolved_oxygen: 'meter',
  salinity: 'meter',
};
