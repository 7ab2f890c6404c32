import { describe, expect, it } from 'vitest';
import {
  ChemistryInputError,
  practicalSalinity,
  salinityFromConductivity,
  salinityFromSpecificConductance,
} from './index';

// PSS-78 is written in IPTS-68; these functions take ITS-90, so a check value at t68 is passed as t68 / 1.00024.
const fromT68 = (t68: number): number => t68 / 1.00024;

describe('practicalSalinity (PSS-78)', () => {
  it('gives S 35.0000 at R = 1, t68 = 15 °C, p = 0', () => {
    // UNESCO 1983, Technical Papers in Marine Science 44, check value (published)
    expect(Math.abs(practicalSalinity({ conductivityRatio: 1, temperatureC: fromT68(15) }) - 35)).toBeLessThan(0.00005);
  });

  it('gives S 40.0000 at R = 1.888091, t68 = 40 °C, p = 10000 dbar', () => {
    // UNESCO 1983, Technical Papers in Marine Science 44, check value (published)
    const s = practicalSalinity({ conductivityRatio: 1.888091, temperatureC: fromT68(40), pressureDbar: 10000 });
    expect(Math.abs(s - 40)).toBeLessThan(0.00005);
  });

  it('returns 0 at zero conductivity', () => {
    // Hill, Dauphinee & Woods 1986 form is 0 at R = 0 (computed)
    expect(practicalSalinity({ conductivityRatio: 0, temperatureC: 20 })).toBeCloseTo(0, 12);
  });

  it.each([0, 10, 25, 35])('joins PSS-78 without a step at S = 2 at %s °C (Hill extension)', (temperatureC) => {
    // Hill, Dauphinee & Woods 1986 scaled as in TEOS-10, continuity at S = 2 (computed)
    const s = (conductivityRatio: number): number => practicalSalinity({ conductivityRatio, temperatureC });
    let lo = 0.01;
    let hi = 0.2;
    for (let i = 0; i < 200; i += 1) {
      const mid = (lo + hi) / 2;
      if (s(mid) < 2) lo = mid;
      else hi = mid;
    }
    // An unscaled Hill correction would leave a step of about 1e-5 here; the scaled one leaves only the slope × 2e-10.
    expect(Math.abs(s(lo + 1e-10) - s(lo - 1e-10))).toBeLessThan(1e-7);
    expect(s(lo - 1e-10)).toBeCloseTo(2, 6);
  });

  it('rises steadily through the low-salinity range', () => {
    // monotonic conductivity–salinity relation (computed)
    let previous = -1;
    for (let r = 0; r <= 0.2; r += 0.001) {
      const s = practicalSalinity({ conductivityRatio: r, temperatureC: 20 });
      expect(s).toBeGreaterThan(previous);
      previous = s;
    }
  });

  it('rejects negative ratios, temperatures outside −2..40 °C and pressures outside 0–10000 dbar', () => {
    // PSS-78 validity (published), widened to 40 °C for its own check value (common practice, no source)
    expect(() => practicalSalinity({ conductivityRatio: -0.1, temperatureC: 20 })).toThrow(ChemistryInputError);
    expect(() => practicalSalinity({ conductivityRatio: 1, temperatureC: 45 })).toThrow(ChemistryInputError);
    expect(() => practicalSalinity({ conductivityRatio: 1, temperatureC: 20, pressureDbar: -1 })).toThrow(
      ChemistryInputError,
    );
    expect(() => practicalSalinity({ conductivityRatio: Number.NaN, temperatureC: 20 })).toThrow(ChemistryInputError);
  });
});

describe('salinityFromConductivity (in situ)', () => {
  it('gives S 35 for 42.914 mS/cm at 15 °C (t68)', () => {
    // UNESCO 1983 definition C(35,15,0) = 42.914 mS/cm (published)
    expect(salinityFromConductivity({ conductivityMsCm: 42.914, temperatureC: fromT68(15) })).toBeCloseTo(35, 4);
  });

  it('rejects conductivity above 100 mS/cm', () => {
    // probe physical limit (common practice, no source)
    expect(() => salinityFromConductivity({ conductivityMsCm: 120, temperatureC: 20 })).toThrow(ChemistryInputError);
  });
});

describe('salinityFromSpecificConductance (referenced to 25 °C)', () => {
  // The computed pairs in water-chemistry.md §4 evaluate PSS-78 at t68 = 25 exactly. Gillwise takes the
  // 25 °C reference on ITS-90 (t68 = 25.006), which lowers S by 0.0014 at S 10 and 0.0045 at S 35 —
  // far below probe accuracy. Both are checked.
  it('gives S 10 for 17.022 mS/cm', () => {
    // PSS-78 at 25 °C (computed)
    expect(Math.abs(salinityFromSpecificConductance({ specificConductanceMsCm: 17.022 }) - 10)).toBeLessThan(0.002);
    expect(
      Math.abs(practicalSalinity({ conductivityRatio: 17.022 / 42.914, temperatureC: fromT68(25) }) - 10),
    ).toBeLessThan(0.0005);
  });

  it('gives S 35 for 53.065 mS/cm', () => {
    // PSS-78 at 25 °C (computed)
    expect(Math.abs(salinityFromSpecificConductance({ specificConductanceMsCm: 53.065 }) - 35)).toBeLessThan(0.005);
    expect(
      Math.abs(practicalSalinity({ conductivityRatio: 53.065 / 42.914, temperatureC: fromT68(25) }) - 35),
    ).toBeLessThan(0.0005);
  });

  it('gives fresh-water salinity for fresh-water specific conductance', () => {
    // PSS-78 with Hill et al. 1986 extension at 0.5 mS/cm (computed); about 0.24
    const s = salinityFromSpecificConductance({ specificConductanceMsCm: 0.5 });
    expect(s).toBeGreaterThan(0.2);
    expect(s).toBeLessThan(0.3);
  });
});
