// Property tests (fast-check) over the valid input ranges of each method.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  type AmmoniaMethod,
  ChemistryInputError,
  ammoniaMethodInfo,
  freeAmmonia,
  maxFeedKgPerDay,
  practicalSalinity,
  racewayTanRiseMgL,
  tanProductionKgPerDay,
  unionizedFraction,
} from './index';

const methods: AmmoniaMethod[] = ['emerson1975', 'khoo1977', 'cw95-total'];
const real = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
const temperatureFor = (method: AmmoniaMethod) =>
  real(ammoniaMethodInfo[method].temperatureC.min, ammoniaMethodInfo[method].temperatureC.max);
const salinityFor = (method: AmmoniaMethod) => real(0, ammoniaMethodInfo[method].salinityPpt.max);

describe.each(methods)('unionizedFraction with %s', (method) => {
  it('stays strictly between 0 and 1', () => {
    // f = 1/(1 + 10^(pKa − pH)) (computed)
    fc.assert(
      fc.property(real(0, 14), temperatureFor(method), salinityFor(method), (pH, temperatureC, salinityPpt) => {
        const { fraction } = unionizedFraction({ pH, temperatureC, salinityPpt, method });
        expect(fraction).toBeGreaterThan(0);
        expect(fraction).toBeLessThan(1);
      }),
    );
  });

  it('rises with pH', () => {
    // f = 1/(1 + 10^(pKa − pH)) (computed)
    fc.assert(
      fc.property(
        real(0, 13.99),
        real(0.01, 14),
        temperatureFor(method),
        salinityFor(method),
        (pH, step, temperatureC, salinityPpt) => {
          const higher = Math.min(14, pH + step);
          fc.pre(higher - pH >= 0.01);
          const low = unionizedFraction({ pH, temperatureC, salinityPpt, method }).fraction;
          const high = unionizedFraction({ pH: higher, temperatureC, salinityPpt, method }).fraction;
          expect(high).toBeGreaterThan(low);
        },
      ),
    );
  });

  it('rises with temperature', () => {
    // pKa falls with temperature in every method's equation (computed)
    const { min, max } = ammoniaMethodInfo[method].temperatureC;
    fc.assert(
      fc.property(
        real(0, 14),
        real(min, max - 0.1),
        real(0.1, max - min),
        salinityFor(method),
        (pH, temperatureC, step, salinityPpt) => {
          const warmer = Math.min(max, temperatureC + step);
          fc.pre(warmer - temperatureC >= 0.1);
          const cool = unionizedFraction({ pH, temperatureC, salinityPpt, method }).fraction;
          const warm = unionizedFraction({ pH, temperatureC: warmer, salinityPpt, method }).fraction;
          expect(warm).toBeGreaterThan(cool);
        },
      ),
    );
  });

  it('throws a ChemistryInputError, never NaN, for out-of-range or non-finite inputs', () => {
    const bad = fc.oneof(
      fc.constant(Number.NaN),
      fc.constant(Number.POSITIVE_INFINITY),
      fc.constant(Number.NEGATIVE_INFINITY),
      real(-1e6, -1e-9),
      real(14 + 1e-9, 1e6),
    );
    fc.assert(
      fc.property(bad, temperatureFor(method), (pH, temperatureC) => {
        expect(() => unionizedFraction({ pH, temperatureC, method })).toThrow(ChemistryInputError);
      }),
    );
    const { max } = ammoniaMethodInfo[method].temperatureC;
    fc.assert(
      fc.property(
        real(0, 14),
        fc.oneof(fc.constant(Number.NaN), real(max + 1e-9, 1e6), real(-1e6, -2 - 1e-9)),
        (pH, temperatureC) => {
          expect(() => unionizedFraction({ pH, temperatureC, method })).toThrow(ChemistryInputError);
        },
      ),
    );
    fc.assert(
      fc.property(
        real(0, 14),
        temperatureFor(method),
        fc.oneof(fc.constant(Number.NaN), real(45 + 1e-9, 1e6), real(-1e6, -1e-9)),
        (pH, temperatureC, salinityPpt) => {
          expect(() => unionizedFraction({ pH, temperatureC, salinityPpt, method })).toThrow(ChemistryInputError);
        },
      ),
    );
  });
});

describe('unionizedFraction and salinity', () => {
  it('falls with salinity under khoo1977', () => {
    // Khoo et al. 1977: pKa rises with ionic strength while 0.1552 − 0.0003142·t > 0 (computed)
    fc.assert(
      fc.property(real(0, 14), real(0, 50), real(0, 44.9), real(0.1, 45), (pH, temperatureC, salinityPpt, step) => {
        const saltier = Math.min(45, salinityPpt + step);
        fc.pre(saltier - salinityPpt >= 0.1);
        const fresh = unionizedFraction({ pH, temperatureC, salinityPpt, method: 'khoo1977' }).fraction;
        const salt = unionizedFraction({ pH, temperatureC, salinityPpt: saltier, method: 'khoo1977' }).fraction;
        // At pH 14 both fractions round towards 1; compare the NH4+ share instead, which keeps its precision.
        expect(1 / salt - 1).toBeGreaterThan(1 / fresh - 1);
      }),
    );
  });

  it('does not rise with salinity under emerson1975 or under the default rule', () => {
    // Emerson ignores salinity; the default switches to Khoo from 0.5 ‰ (computed)
    fc.assert(
      fc.property(real(0, 14), real(0, 50), real(0, 45), real(0, 45), (pH, temperatureC, s1, s2) => {
        const [lo, hi] = s1 <= s2 ? [s1, s2] : [s2, s1];
        const emersonLo = unionizedFraction({ pH, temperatureC, salinityPpt: lo, method: 'emerson1975' }).fraction;
        const emersonHi = unionizedFraction({ pH, temperatureC, salinityPpt: hi, method: 'emerson1975' }).fraction;
        expect(emersonHi).toBe(emersonLo);
        const defaultLo = unionizedFraction({ pH, temperatureC, salinityPpt: lo }).fraction;
        const defaultHi = unionizedFraction({ pH, temperatureC, salinityPpt: hi }).fraction;
        expect(defaultHi).toBeLessThanOrEqual(defaultLo);
      }),
    );
  });
});

describe('maxFeedKgPerDay', () => {
  it('inverts the forward calculation: feeding the answer gives the target outlet NH3-N', () => {
    // water-chemistry.md §6 forward calculation (computed)
    fc.assert(
      fc.property(
        real(0.001, 0.1),
        real(0, 0.5),
        real(50, 20000),
        real(0.2, 0.6),
        real(6, 9.5),
        real(2, 32),
        real(0, 40),
        fc.constantFrom<AmmoniaMethod | undefined>(undefined, 'emerson1975', 'khoo1977', 'cw95-total'),
        (targetNh3NMgL, inletTanMgL, flowLpm, proteinFraction, pH, temperatureC, salinityPpt, method) => {
          const feedKgPerDay = maxFeedKgPerDay({
            targetNh3NMgL,
            inletTanMgL,
            flowLpm,
            proteinFraction,
            pH,
            temperatureC,
            salinityPpt,
            ...(method ? { method } : {}),
          });
          expect(Number.isFinite(feedKgPerDay)).toBe(true);
          expect(feedKgPerDay).toBeGreaterThanOrEqual(0);
          const rise = racewayTanRiseMgL({
            tanProductionKgPerDay: tanProductionKgPerDay({ feedKgPerDay, proteinFraction }),
            flowLpm,
          });
          const outlet = freeAmmonia({
            readingMgL: inletTanMgL + rise,
            basis: 'tan-n',
            pH,
            temperatureC,
            salinityPpt,
            ...(method ? { method } : {}),
          });
          if (feedKgPerDay > 0) expect(outlet.nh3NMgL).toBeCloseTo(targetNh3NMgL, 9);
          else expect(outlet.nh3NMgL).toBeGreaterThanOrEqual(targetNh3NMgL * (1 - 1e-12));
        },
      ),
    );
  });
});

describe('practicalSalinity', () => {
  it('returns a finite salinity of at least 0 for every valid input', () => {
    // PSS-78 with Hill et al. 1986 (computed)
    fc.assert(
      fc.property(real(0, 2.3), real(-2, 40), real(0, 10000), (conductivityRatio, temperatureC, pressureDbar) => {
        const s = practicalSalinity({ conductivityRatio, temperatureC, pressureDbar });
        expect(Number.isFinite(s)).toBe(true);
        expect(s).toBeGreaterThanOrEqual(0);
      }),
    );
  });
});
