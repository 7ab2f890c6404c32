import { describe, expect, it } from 'vitest';
import {
  ChemistryInputError,
  maxFeedKgPerDay,
  racewayTanRiseMgL,
  tanProductionKgPerDay,
  unionizedFraction,
} from './index';

describe('tanProductionKgPerDay', () => {
  it('gives 2.208 kg TAN/day for 60 kg feed at 40 % protein (4,000 kg fish at 1.5 % BW)', () => {
    // Losordo & DeLong set-up with Timmons & Ebeling factor 0.092 (computed)
    expect(tanProductionKgPerDay({ feedKgPerDay: 60, proteinFraction: 0.4 })).toBeCloseTo(2.208, 10);
  });

  it('rejects a protein percentage passed where a fraction belongs', () => {
    // protein is a fraction 0–1 (common practice, no source)
    expect(() => tanProductionKgPerDay({ feedKgPerDay: 60, proteinFraction: 40 })).toThrow(ChemistryInputError);
  });
});

describe('racewayTanRiseMgL', () => {
  it('gives 1.533 mg/L for 2.208 kg TAN/day at 1000 L/min', () => {
    // steady-state raceway mass balance, water-chemistry.md §6 (computed)
    expect(Math.abs(racewayTanRiseMgL({ tanProductionKgPerDay: 2.208, flowLpm: 1000 }) - 1.533)).toBeLessThan(0.0005);
  });

  it('rejects zero flow', () => {
    // a flow-through raceway needs inflow (common practice, no source)
    expect(() => racewayTanRiseMgL({ tanProductionKgPerDay: 1, flowLpm: 0 })).toThrow(ChemistryInputError);
  });
});

describe('maxFeedKgPerDay', () => {
  it('gives back the 60 kg/day of the worked example when the target is its outlet NH3-N', () => {
    // forward calculation of water-chemistry.md §6 with Emerson et al. 1975 (computed)
    const conditions = { pH: 7.5, temperatureC: 15, salinityPpt: 0 };
    const { fraction } = unionizedFraction(conditions);
    const outletTan = 0.1 + racewayTanRiseMgL({ tanProductionKgPerDay: 2.208, flowLpm: 1000 });
    const feed = maxFeedKgPerDay({
      targetNh3NMgL: fraction * outletTan,
      inletTanMgL: 0.1,
      flowLpm: 1000,
      proteinFraction: 0.4,
      ...conditions,
    });
    expect(feed).toBeCloseTo(60, 8);
  });

  it('returns 0 when the inlet alone already exceeds the target', () => {
    // forward calculation of water-chemistry.md §6 (computed)
    const feed = maxFeedKgPerDay({
      targetNh3NMgL: 0.02,
      inletTanMgL: 2,
      flowLpm: 1000,
      proteinFraction: 0.4,
      pH: 8.5,
      temperatureC: 25,
      salinityPpt: 0,
    });
    expect(feed).toBe(0);
  });
});
