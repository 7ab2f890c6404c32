// Smaller published rules: chloride against nitrite toxicity and free CO2 from alkalinity and pH.
import { checkRange } from './errors';

/** Basis of a nitrite result: as nitrogen (NO2-N) or as nitrite ion (NO2; = NO2-N × 3.28454). */
export type NitriteBasis = 'no2-n' | 'no2';

export type ChlorideNitriteCheck = {
  /** Chloride : nitrite (mg/L : mg/L on the given nitrite basis); null when nitrite is 0. */
  ratio: number | null;
  minimumRatio: number;
  /** True when the ratio meets the minimum (or there is no nitrite). */
  ok: boolean;
  /** Chloride the water needs for the minimum ratio, mg/L. */
  chlorideNeededMgL: number;
  /** Chloride still to add, mg/L (0 when ok). */
  chlorideToAddMgL: number;
  /** Stored with the result: SRAC 462 does not settle whether its ratio is on NO2 or NO2-N. */
  nitriteBasis: NitriteBasis;
};

const CONCENTRATION = { min: 0, max: 1e5 } as const;

/** Chloride : nitrite ratio against nitrite toxicity, minimum 10 : 1 (Durborow, Crosby & Brunson 1997, SRAC 462). */
export function chlorideNitriteRatio({
  chlorideMgL,
  nitriteMgL,
  nitriteBasis,
  minimumRatio = 10,
}: {
  chlorideMgL: number;
  nitriteMgL: number;
  nitriteBasis: NitriteBasis;
  minimumRatio?: number;
}): ChlorideNitriteCheck {
  checkRange({ field: 'chlorideMgL', value: chlorideMgL, ...CONCENTRATION });
  checkRange({ field: 'nitriteMgL', value: nitriteMgL, ...CONCENTRATION });
  checkRange({ field: 'minimumRatio', value: minimumRatio, min: 0, max: 1000 });
  if (nitriteBasis !== 'no2-n' && nitriteBasis !== 'no2') throw new RangeError('nitriteBasis must be no2-n or no2');
  const chlorideNeededMgL = minimumRatio * nitriteMgL;
  const ratio = nitriteMgL === 0 ? null : chlorideMgL / nitriteMgL;
  return {
    ratio,
    minimumRatio,
    ok: chlorideMgL >= chlorideNeededMgL,
    chlorideNeededMgL,
    chlorideToAddMgL: Math.max(0, chlorideNeededMgL - chlorideMgL),
    nitriteBasis,
  };
}

/** g NaCl per g Cl: 58.443 / 35.453 from molar masses (computed). */
export const NACL_PER_CHLORIDE = 58.44277 / 35.453;

/** Salt (kg NaCl) to raise chloride by a given amount in a volume: 1.6485 g per m³ per mg/L Cl (computed). */
export function saltToRaiseChlorideKg({
  volumeM3,
  chlorideRiseMgL,
}: {
  volumeM3: number;
  chlorideRiseMgL: number;
}): number {
  checkRange({ field: 'volumeM3', value: volumeM3, min: 0, max: 1e9 });
  checkRange({ field: 'chlorideRiseMgL', value: chlorideRiseMgL, ...CONCENTRATION });
  // mg/L = g/m³, so grams of chloride = volume × rise.
  return (volumeM3 * chlorideRiseMgL * NACL_PER_CHLORIDE) / 1000;
}

// The approximation treats all alkalinity as bicarbonate: fair from about pH 4.5 (no alkalinity
// left below) to 8.5 (carbonate becomes significant above).
const CO2_PH_RANGE = { min: 4.5, max: 8.5 } as const;

/** Free CO2, mg/L ≈ 2.0 × alkalinity (mg/L CaCO3) × 10^(6 − pH), near 25 °C (APHA 4500-CO2 nomographic relation; from memory). */
export function freeCo2MgL({ alkalinityMgLCaCO3, pH }: { alkalinityMgLCaCO3: number; pH: number }): number {
  checkRange({ field: 'alkalinityMgLCaCO3', value: alkalinityMgLCaCO3, min: 0, max: 5000 });
  checkRange({ field: 'pH', value: pH, ...CO2_PH_RANGE, reason: 'range where alkalinity is mostly bicarbonate' });
  return 2.0 * alkalinityMgLCaCO3 * 10 ** (6 - pH);
}
