import { describe, expect, it } from 'vitest';
import {
  ChemistryInputError,
  forecastPeakNh3,
  freeAmmonia,
  ionicStrengthFromSalinity,
  unionizedFraction,
} from './index';

describe('unionizedFraction by Emerson et al. 1975 (fresh water)', () => {
  // Emerson et al. 1975 via UF/IFAS FA16 table (published); tolerance ±0.00005 against 4-decimal values.
  const table = [
    { temperatureC: 6, pH: 7.0, fraction: 0.0013 },
    { temperatureC: 10, pH: 8.0, fraction: 0.0182 },
    { temperatureC: 20, pH: 7.0, fraction: 0.0039 },
    { temperatureC: 24, pH: 8.2, fraction: 0.0772 },
    { temperatureC: 28, pH: 8.6, fraction: 0.2178 },
  ];
  it.each(table)(
    'matches the FA16 table at $temperatureC °C and pH $pH (fraction $fraction)',
    ({ temperatureC, pH, fraction }) => {
      // Emerson et al. 1975 via UF/IFAS FA16 table (published)
      const result = unionizedFraction({ pH, temperatureC, method: 'emerson1975' });
      expect(Math.abs(result.fraction - fraction)).toBeLessThanOrEqual(0.00005);
    },
  );

  it('is the default in fresh water and reports the NBS pH scale', () => {
    // default-method rule of water-chemistry.md §2 (common practice, no source)
    const result = unionizedFraction({ pH: 8, temperatureC: 10, salinityPpt: 0.4 });
    expect(result.method).toBe('emerson1975');
    expect(result.pHScale).toBe('nbs');
  });

  it('returns the pKa it used', () => {
    // Emerson et al. 1975 equation pKa = 0.09018 + 2729.92/T at 25 °C (computed)
    expect(unionizedFraction({ pH: 7, temperatureC: 25 }).pKa).toBeCloseTo(0.09018 + 2729.92 / 298.15, 12);
  });
});

describe('unionizedFraction by Khoo, Culberson & Bates 1977 (salinity-corrected)', () => {
  it('reduces exactly to Emerson at salinity 0', () => {
    // Khoo et al. 1977 form reduces to Emerson at S = 0 (computed)
    for (const [temperatureC, pH] of [
      [5, 7.5],
      [24, 8.2],
      [32, 9],
    ] as const) {
      const khoo = unionizedFraction({ pH, temperatureC, salinityPpt: 0, method: 'khoo1977' });
      const emerson = unionizedFraction({ pH, temperatureC, salinityPpt: 0, method: 'emerson1975' });
      expect(khoo.fraction).toBe(emerson.fraction);
    }
  });

  it('gives about 6.2 % NH3 at 35 ‰, 24 °C, pH 8.2', () => {
    // full-seawater chart value (common practice, no source); ±0.2 percentage points
    const { fraction } = unionizedFraction({ pH: 8.2, temperatureC: 24, salinityPpt: 35, method: 'khoo1977' });
    expect(Math.abs(fraction * 100 - 6.2)).toBeLessThanOrEqual(0.2);
  });

  it('gives 0.06145 at 35 ‰, 24 °C, pH 8.2', () => {
    // Khoo et al. 1977 equation, water-chemistry.md §2 (computed)
    const { fraction } = unionizedFraction({ pH: 8.2, temperatureC: 24, salinityPpt: 35, method: 'khoo1977' });
    expect(Math.abs(fraction - 0.06145)).toBeLessThanOrEqual(0.000005);
  });

  it('uses temperature in °C in the ionic-strength term, not kelvin (which would give about 0.0702)', () => {
    // kelvin-mistake value 0.0702, water-chemistry.md §2 (computed)
    const { fraction } = unionizedFraction({ pH: 8.2, temperatureC: 24, salinityPpt: 35, method: 'khoo1977' });
    expect(Math.abs(fraction - 0.0702)).toBeGreaterThan(0.005);
  });

  it('is the default from 0.5 ‰ and reports the NBS pH scale', () => {
    // default-method rule of water-chemistry.md §2 (common practice, no source)
    const result = unionizedFraction({ pH: 8, temperatureC: 25, salinityPpt: 0.5 });
    expect(result.method).toBe('khoo1977');
    expect(result.pHScale).toBe('nbs');
  });

  it('computes ionic strength from salinity as 19.9273·S/(1000 − 1.005109·S)', () => {
    // ionic-strength form used with Khoo, water-chemistry.md §2 (from memory); value at S 35 (computed)
    expect(ionicStrengthFromSalinity({ salinityPpt: 35 })).toBeCloseTo((19.9273 * 35) / (1000 - 1.005109 * 35), 12);
    expect(ionicStrengthFromSalinity({ salinityPpt: 35 })).toBeCloseTo(0.72289, 5);
  });
});

describe('unionizedFraction by Clegg & Whitfield 1995 eq. 18 (total pH scale)', () => {
  // Clegg & Whitfield 1995 eq. 18 check values, water-chemistry.md §2 (computed, matching an independent implementation)
  const checks = [
    { pH: 8, temperatureC: 10, salinityPpt: 0, fraction: 0.0183 },
    { pH: 8, temperatureC: 25, salinityPpt: 0, fraction: 0.0539 },
    { pH: 8, temperatureC: 25, salinityPpt: 35, fraction: 0.0556 },
    { pH: 7.8, temperatureC: 25, salinityPpt: 35, fraction: 0.0358 },
  ];
  it.each(checks)(
    'gives $fraction at pH $pH, $temperatureC °C, S $salinityPpt',
    ({ pH, temperatureC, salinityPpt, fraction }) => {
      // Clegg & Whitfield 1995 eq. 18 (computed)
      const result = unionizedFraction({ pH, temperatureC, salinityPpt, method: 'cw95-total' });
      expect(Math.abs(result.fraction - fraction)).toBeLessThanOrEqual(0.00005);
      expect(result.pHScale).toBe('total');
      expect(result.method).toBe('cw95-total');
    },
  );

  it('is never chosen by default, even in full seawater', () => {
    // default-method rule of water-chemistry.md §2 (common practice, no source)
    expect(unionizedFraction({ pH: 8, temperatureC: 25, salinityPpt: 35 }).method).toBe('khoo1977');
  });

  it('rejects temperatures and salinities outside −2..40 °C and S 0–40', () => {
    // Clegg & Whitfield 1995 validity range (published)
    expect(() => unionizedFraction({ pH: 8, temperatureC: 41, salinityPpt: 35, method: 'cw95-total' })).toThrow(
      ChemistryInputError,
    );
    expect(() => unionizedFraction({ pH: 8, temperatureC: -3, salinityPpt: 35, method: 'cw95-total' })).toThrow(
      ChemistryInputError,
    );
    expect(() => unionizedFraction({ pH: 8, temperatureC: 25, salinityPpt: 42, method: 'cw95-total' })).toThrow(
      ChemistryInputError,
    );
    expect(
      unionizedFraction({ pH: 8, temperatureC: -2, salinityPpt: 35, method: 'cw95-total' }).fraction,
    ).toBeGreaterThan(0);
  });
});

describe('unionizedFraction input checks', () => {
  it('throws a ChemistryInputError naming the field and its range for pH 14.5', () => {
    // pH scale limits 0–14 (common practice, no source)
    try {
      unionizedFraction({ pH: 14.5, temperatureC: 20 });
      expect.unreachable('should have thrown');
    } catch (error) {
      expect(error).toBeInstanceOf(ChemistryInputError);
      const e = error as ChemistryInputError;
      expect(e.field).toBe('pH');
      expect(e.min).toBe(0);
      expect(e.max).toBe(14);
      expect(e.value).toBe(14.5);
      expect(e.message).toMatch(/pH must be a finite number from 0 to 14/);
    }
  });

  it('rejects Emerson temperatures outside 0–50 °C, salinity above 45 and NaN or Infinity', () => {
    // Emerson et al. 1975 validity 0–50 °C (published); salinity limit 45 (common practice, no source)
    expect(() => unionizedFraction({ pH: 8, temperatureC: 51 })).toThrow(/temperatureC .*0 to 50/);
    expect(() => unionizedFraction({ pH: 8, temperatureC: -0.1 })).toThrow(ChemistryInputError);
    expect(() => unionizedFraction({ pH: 8, temperatureC: 20, salinityPpt: 46 })).toThrow(/salinityPpt/);
    expect(() => unionizedFraction({ pH: 8, temperatureC: 20, salinityPpt: -1 })).toThrow(ChemistryInputError);
    expect(() => unionizedFraction({ pH: Number.NaN, temperatureC: 20 })).toThrow(ChemistryInputError);
    expect(() => unionizedFraction({ pH: 8, temperatureC: Number.POSITIVE_INFINITY })).toThrow(ChemistryInputError);
  });
});

describe('freeAmmonia', () => {
  it('converts a TAN-N reading with the Emerson fraction and gives NH3 as N and as NH3', () => {
    // Emerson et al. 1975 (published equation); NH3 = NH3-N × 1.21588 from molar masses (computed)
    const result = freeAmmonia({ readingMgL: 2, basis: 'tan-n', pH: 8.2, temperatureC: 24, salinityPpt: 0 });
    const { fraction } = unionizedFraction({ pH: 8.2, temperatureC: 24 });
    expect(result.tanMgL).toBe(2);
    expect(result.nh3NMgL).toBeCloseTo(2 * fraction, 12);
    expect(result.nh3MgL).toBeCloseTo(2 * fraction * 1.21588, 12);
    expect(result.nh3NMgL).toBeCloseTo(0.1545, 4);
    expect(result).toMatchObject({ method: 'emerson1975', pHScale: 'nbs' });
  });

  it('reads a total-NH3 kit result as N by dividing by 1.21588', () => {
    // NH3/N molar-mass ratio (computed)
    const result = freeAmmonia({ readingMgL: 1.21588, basis: 'total-nh3', pH: 7, temperatureC: 20, salinityPpt: 0 });
    expect(result.tanMgL).toBeCloseTo(1, 12);
  });

  it('reads a total-NH4 kit result as N by dividing by 1.28785', () => {
    // NH4+/N molar-mass ratio (computed)
    const result = freeAmmonia({ readingMgL: 2.5757, basis: 'total-nh4', pH: 7, temperatureC: 20, salinityPpt: 0 });
    expect(result.tanMgL).toBeCloseTo(2, 12);
  });

  it('uses Khoo by default in seawater and honours an explicit method', () => {
    // default-method rule of water-chemistry.md §2 (common practice, no source); Khoo value 0.06145 (computed)
    const khoo = freeAmmonia({ readingMgL: 1, basis: 'tan-n', pH: 8.2, temperatureC: 24, salinityPpt: 35 });
    expect(khoo.method).toBe('khoo1977');
    expect(khoo.nh3NMgL).toBeCloseTo(0.06145, 5);
    const cw = freeAmmonia({
      readingMgL: 1,
      basis: 'tan-n',
      pH: 8,
      temperatureC: 25,
      salinityPpt: 35,
      method: 'cw95-total',
    });
    expect(cw.pHScale).toBe('total');
  });

  it('rejects a negative reading', () => {
    // a concentration cannot be negative (common practice, no source)
    expect(() => freeAmmonia({ readingMgL: -0.1, basis: 'tan-n', pH: 7, temperatureC: 20, salinityPpt: 0 })).toThrow(
      ChemistryInputError,
    );
  });
});

describe('forecastPeakNh3', () => {
  const series = [
    { at: '2026-06-01T06:00:00.000Z', pH: 7.4, temperatureC: 24 },
    { at: '2026-06-01T15:00:00.000Z', pH: 8.9, temperatureC: 29 },
    { at: '2026-06-01T21:00:00.000Z', pH: 8.1, temperatureC: 27 },
  ];

  it('returns the afternoon peak of pH and temperature with the time as given', () => {
    // Emerson et al. 1975 equation at the peak point (computed)
    const peak = forecastPeakNh3({ tanMgL: 1.5, series });
    const expected = unionizedFraction({ pH: 8.9, temperatureC: 29 }).fraction * 1.5;
    expect(peak.at).toBe('2026-06-01T15:00:00.000Z');
    expect(peak.nh3NMgL).toBeCloseTo(expected, 12);
    expect(peak.nh3MgL).toBeCloseTo(expected * 1.21588, 12);
  });

  it('hands back epoch milliseconds and Date objects in the form received', () => {
    // form of `at` is a contract detail (common practice, no source)
    const ms = Date.parse('2026-06-01T15:00:00.000Z');
    expect(forecastPeakNh3({ tanMgL: 1, series: series.map((p) => ({ ...p, at: Date.parse(p.at) })) }).at).toBe(ms);
    const dates = series.map((p) => ({ ...p, at: new Date(p.at) }));
    expect(forecastPeakNh3({ tanMgL: 1, series: dates }).at).toBe(dates[1]?.at);
  });

  it('applies salinity and method to every point', () => {
    // Khoo et al. 1977 at the peak point (computed)
    const peak = forecastPeakNh3({ tanMgL: 1, series, salinityPpt: 30 });
    expect(peak.method).toBe('khoo1977');
    expect(peak.nh3NMgL).toBeCloseTo(unionizedFraction({ pH: 8.9, temperatureC: 29, salinityPpt: 30 }).fraction, 12);
  });

  it('throws on an empty series', () => {
    expect(() => forecastPeakNh3({ tanMgL: 1, series: [] })).toThrow(/at least one point/);
  });

  it('names the bad point when a forecast value is out of range', () => {
    // pH scale limits 0–14 (common practice, no source)
    expect(() => forecastPeakNh3({ tanMgL: 1, series: [...series, { at: 0, pH: 15, temperatureC: 20 }] })).toThrow(
      /series\[3\]\.pH/,
    );
    expect(() => forecastPeakNh3({ tanMgL: 1, series: [{ at: 'not a time', pH: 7, temperatureC: 20 }] })).toThrow(
      ChemistryInputError,
    );
  });
});
