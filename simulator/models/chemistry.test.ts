import { describe, expect, it } from 'vitest';
import { salinityFromConductivity, salinityFromSpecificConductance } from '../../shared/chemistry';
import {
  carbonateConstants,
  carbonateFromDic,
  conductivityFromSalinity,
  dicFromPh,
  doSaturationMgL,
  specificConductanceFromSalinity,
} from './chemistry';

describe('conductance from salinity (PSS-78 inverted)', () => {
  it('matches the computed check values: 17.022 mS/cm ↔ S 10 and 53.065 ↔ S 35 (water-chemistry.md §4, computed)', () => {
    expect(specificConductanceFromSalinity(10)).toBeCloseTo(17.022, 1);
    expect(specificConductanceFromSalinity(35)).toBeCloseTo(53.065, 1);
  });

  it('specific conductance round-trips to salinity across fresh, brackish and marine water', () => {
    for (const s of [0.05, 0.2, 1, 1.99, 2, 5, 15, 18, 20, 35, 42]) {
      const sc = specificConductanceFromSalinity(s);
      expect(salinityFromSpecificConductance({ specificConductanceMsCm: sc })).toBeCloseTo(s, 6);
    }
  });

  it('in-situ conductivity round-trips to salinity at the water temperature', () => {
    for (const [s, t] of [
      [18, 28],
      [0.3, 12],
      [35, 5],
    ] as const) {
      const c = conductivityFromSalinity(s, t);
      expect(salinityFromConductivity({ conductivityMsCm: c, temperatureC: t })).toBeCloseTo(s, 6);
    }
  });

  it('zero salinity reads zero conductance', () => {
    expect(specificConductanceFromSalinity(0)).toBe(0);
  });
});

describe('carbonate system', () => {
  it('has the textbook constants at 25 °C: pK1 6.35, pK2 10.33, pKH 1.47 (Plummer & Busenberg 1982, from memory)', () => {
    const c = carbonateConstants(25, 0);
    expect(-Math.log10(c.k1)).toBeCloseTo(6.35, 2);
    expect(-Math.log10(c.k2)).toBeCloseTo(10.33, 2);
    expect(-Math.log10(c.kh)).toBeCloseTo(1.47, 2);
    expect(-Math.log10(c.kw)).toBeCloseTo(14.0, 1);
  });

  it('pH from DIC and alkalinity inverts DIC from pH', () => {
    const c = carbonateConstants(27, 0);
    for (const ph of [6.8, 7.5, 8.2, 9.0, 9.6]) {
      expect(carbonateFromDic(c, dicFromPh(c, ph, 1.2), 1.2).ph).toBeCloseTo(ph, 5);
    }
  });

  it('removing carbon at constant alkalinity raises pH, as photosynthesis does', () => {
    const c = carbonateConstants(27, 0);
    const dic = dicFromPh(c, 7.5, 1.2);
    expect(carbonateFromDic(c, dic - 0.15, 1.2).ph).toBeGreaterThan(8.5);
  });
});

describe('DO saturation', () => {
  it('is 9.09 mg/L at 20 °C in fresh water (Benson & Krause 1984, published) and lower in brackish water', () => {
    expect(doSaturationMgL(20, 0)).toBeCloseTo(9.09, 2);
    expect(doSaturationMgL(20, 18)).toBeLessThan(doSaturationMgL(20, 0));
  });
});
