import { describe, expect, it } from 'vitest';
import { ChemistryInputError, epa2013Criteria } from './index';

const twoSignificant = (value: number): number => Number(value.toPrecision(2));

describe('epa2013Criteria', () => {
  it('gives CMC 17 and CCC 1.9 mg TAN/L at pH 7 and 20 °C, rounded to 2 significant figures', () => {
    // US EPA 2013, EPA 822-R-13-001 headline values (published)
    for (const oncorhynchusPresent of [true, false]) {
      const criteria = epa2013Criteria({ pH: 7, temperatureC: 20, oncorhynchusPresent });
      expect(twoSignificant(criteria.cmcMgL)).toBe(17);
      expect(twoSignificant(criteria.cccMgL)).toBe(1.9);
    }
  });

  it('gives the 4-day limit as 2.5 × the unrounded CCC, 4.72 (EPA rounds it from 1.9 to 4.8)', () => {
    // US EPA 2013: 2.5 × 1.9 = 4.8 published; the unrounded 4.72 is what is tested here (computed)
    const criteria = epa2013Criteria({ pH: 7, temperatureC: 20, oncorhynchusPresent: false });
    expect(criteria.fourDayMaxMgL).toBeCloseTo(2.5 * criteria.cccMgL, 12);
    expect(Math.abs(criteria.fourDayMaxMgL - 4.72)).toBeLessThan(0.005);
  });

  it('gives CCC 4.9 at pH 6.5 for every temperature up to 7 °C', () => {
    // US EPA 2013 table entry (from memory)
    for (const temperatureC of [0, 3.5, 7]) {
      expect(twoSignificant(epa2013Criteria({ pH: 6.5, temperatureC, oncorhynchusPresent: false }).cccMgL)).toBe(4.9);
    }
  });

  it('gives CMC 51 with Oncorhynchus absent at pH 6.5 for every temperature up to 10 °C', () => {
    // US EPA 2013 table entry (from memory)
    for (const temperatureC of [0, 5, 10]) {
      expect(twoSignificant(epa2013Criteria({ pH: 6.5, temperatureC, oncorhynchusPresent: false }).cmcMgL)).toBe(51);
    }
  });

  it('gives CMC 33 with Oncorhynchus present at pH 6.5 for every temperature up to 14 °C', () => {
    // US EPA 2013 table entry (from memory)
    for (const temperatureC of [0, 7, 14]) {
      expect(twoSignificant(epa2013Criteria({ pH: 6.5, temperatureC, oncorhynchusPresent: true }).cmcMgL)).toBe(33);
    }
  });

  it('rejects pH and temperatures outside the tables (pH 6.5–9, 0–30 °C)', () => {
    // range of the EPA 2013 tables (from memory)
    expect(() => epa2013Criteria({ pH: 9.5, temperatureC: 20, oncorhynchusPresent: false })).toThrow(
      ChemistryInputError,
    );
    expect(() => epa2013Criteria({ pH: 7, temperatureC: 31, oncorhynchusPresent: false })).toThrow(ChemistryInputError);
    expect(() => epa2013Criteria({ pH: Number.NaN, temperatureC: 20, oncorhynchusPresent: false })).toThrow(
      ChemistryInputError,
    );
  });
});
