import { describe, expect, it } from 'vitest';
import { ChemistryInputError, oxygenPercentSaturation, oxygenSaturationMgL, oxygenSolubilityUmolKg } from './index';

describe('oxygenSaturationMgL (Benson & Krause 1984, APHA 4500-O)', () => {
  it('gives 9.09 mg/L at 20 °C in fresh water at 1 atm', () => {
    // Benson & Krause 1984 via APHA 4500-O table (published)
    expect(Math.abs(oxygenSaturationMgL({ temperatureC: 20 }) - 9.09)).toBeLessThan(0.005);
  });

  it('falls with salinity and with temperature', () => {
    // Benson & Krause 1984 equation (published; salinity term from memory)
    expect(oxygenSaturationMgL({ temperatureC: 20, salinityPpt: 35 })).toBeLessThan(
      oxygenSaturationMgL({ temperatureC: 20 }),
    );
    expect(oxygenSaturationMgL({ temperatureC: 30 })).toBeLessThan(oxygenSaturationMgL({ temperatureC: 20 }));
  });

  it('scales almost in proportion to barometric pressure, a little less because of water vapour', () => {
    // APHA 4500-O pressure correction (from memory); ratio below 0.8 at 0.8 atm (computed)
    const ratio =
      oxygenSaturationMgL({ temperatureC: 20, pressureAtm: 0.8 }) / oxygenSaturationMgL({ temperatureC: 20 });
    expect(ratio).toBeLessThan(0.8);
    expect(ratio).toBeGreaterThan(0.79);
  });

  it('rejects temperatures outside 0–40 °C and impossible pressures', () => {
    // Benson & Krause 1984 fit range (from memory)
    expect(() => oxygenSaturationMgL({ temperatureC: 45 })).toThrow(ChemistryInputError);
    expect(() => oxygenSaturationMgL({ temperatureC: 20, pressureAtm: 0 })).toThrow(ChemistryInputError);
  });
});

describe('oxygenSolubilityUmolKg (Garcia & Gordon 1992)', () => {
  it('gives 274.610 µmol/kg at 10 °C and S 35', () => {
    // Garcia & Gordon 1992 check value, Benson & Krause fit (published)
    expect(Math.abs(oxygenSolubilityUmolKg({ temperatureC: 10, salinityPpt: 35 }) - 274.61)).toBeLessThan(0.0005);
  });
});

describe('oxygenPercentSaturation', () => {
  it('gives 100 % for water at saturation and 50 % for half of it', () => {
    // DO percent saturation = measured / C_sat × 100, water-chemistry.md §8 (computed)
    const sat = oxygenSaturationMgL({ temperatureC: 18, salinityPpt: 5, pressureAtm: 0.95 });
    expect(oxygenPercentSaturation({ doMgL: sat, temperatureC: 18, salinityPpt: 5, pressureAtm: 0.95 })).toBeCloseTo(
      100,
      10,
    );
    expect(
      oxygenPercentSaturation({ doMgL: 9.0924 / 2, temperatureC: 20, salinityPpt: 0, pressureAtm: 1 }),
    ).toBeCloseTo(50, 2);
  });

  it('rejects negative DO', () => {
    // DO physical limit 0–40 mg/L (common practice, no source)
    expect(() => oxygenPercentSaturation({ doMgL: -1, temperatureC: 20, salinityPpt: 0, pressureAtm: 1 })).toThrow(
      ChemistryInputError,
    );
  });
});
