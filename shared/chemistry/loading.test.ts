import { describe, expect, it } from 'vitest';
import {
  CM_PER_INCH,
  KG_PER_LB,
  LITRES_PER_US_GALLON,
  M3_PER_FT3,
  densityIndex,
  flowIndex,
  ft3ToM3,
  gpmToLpm,
  hatcheryConstant,
  hatcheryConstantRationPct,
  inchToCm,
  kgToLb,
  racewayCapacityKg,
  ChemistryInputError,
} from './index';

// Piper et al. 1982 indices converted to SI (computed from exact unit definitions).
const perLbFt3In = KG_PER_LB / (M3_PER_FT3 * CM_PER_INCH); // 1 lb/(ft³·in) in kg/(m³·cm)
const perLbGpmIn = KG_PER_LB / (LITRES_PER_US_GALLON * CM_PER_INCH); // 1 lb/(gpm·in) in kg/((L/min)·cm)

describe('raceway loading (Piper et al. 1982)', () => {
  const raceway = {
    volumeM3: ft3ToM3({ volumeFt3: 2000 }),
    inflowLpm: gpmToLpm({ flowGpm: 500 }),
    fishLengthCm: inchToCm({ lengthIn: 6 }),
  };

  it('gives 6,000 lb by DI 0.5 and 4,500 lb by FI 1.5 for 2,000 ft³, 6 in fish and 500 gpm; flow governs', () => {
    // Piper et al. 1982 rules of thumb, husbandry.md §4 (computed)
    const result = racewayCapacityKg({ ...raceway, densityIndexMax: 0.5 * perLbFt3In, flowIndexMax: 1.5 * perLbGpmIn });
    expect(kgToLb({ massKg: result.byDensityKg })).toBeCloseTo(6000, 6);
    expect(kgToLb({ massKg: result.byFlowKg })).toBeCloseTo(4500, 6);
    expect(result.governedBy).toBe('flow');
    expect(result.capacityKg).toBe(result.byFlowKg);
  });

  it('uses DI 3.153 kg/(m³·cm), Piper’s 0.5 lb/(ft³·in), by default', () => {
    // Piper et al. 1982 DI 0.5 converted to SI (computed); 3.153 is rounded, so within 0.02 %
    expect(0.5 * perLbFt3In).toBeCloseTo(3.153, 3);
    const result = racewayCapacityKg({ ...raceway, flowIndexMax: 1.5 * perLbGpmIn });
    expect(Math.abs(kgToLb({ massKg: result.byDensityKg }) - 6000) / 6000).toBeLessThan(0.0002);
  });

  it('scales the flow index by (DO_in − 5)/(DO_sat − 5)', () => {
    // Piper et al. 1982 oxygen scaling, husbandry.md §4 (computed): inflow DO 8 with saturation 10 → 0.6
    const full = racewayCapacityKg({ ...raceway, flowIndexMax: 0.06 });
    const scaled = racewayCapacityKg({ ...raceway, flowIndexMax: 0.06, doInMgL: 8, doSatMgL: 10 });
    expect(scaled.flowIndexDoScaling).toBeCloseTo(0.6, 12);
    expect(scaled.byFlowKg).toBeCloseTo(0.6 * full.byFlowKg, 8);
    expect(racewayCapacityKg({ ...raceway, flowIndexMax: 0.06, doInMgL: 4, doSatMgL: 10 }).capacityKg).toBe(0);
    expect(() => racewayCapacityKg({ ...raceway, flowIndexMax: 0.06, doInMgL: 8 })).toThrow(/both/);
  });

  it('computes DI and FI back from a loading', () => {
    // Piper et al. 1982 definitions DI = W/(V·L), FI = W/(I·L) (computed)
    expect(densityIndex({ weightKg: 6000 * KG_PER_LB, ...raceway }) / perLbFt3In).toBeCloseTo(0.5, 10);
    expect(flowIndex({ weightKg: 4500 * KG_PER_LB, ...raceway }) / perLbGpmIn).toBeCloseTo(1.5, 10);
  });

  it('rejects a zero volume', () => {
    // a raceway has volume (common practice, no source)
    expect(() => racewayCapacityKg({ ...raceway, volumeM3: 0, flowIndexMax: 0.06 })).toThrow(ChemistryInputError);
  });
});

describe('hatchery-constant ration (Haskell 1959; Piper et al. 1982)', () => {
  it('gives HC 14.4 for FCR 1.2 and 0.04 in/day, and 2.4 % BW at 6 in', () => {
    // hatchery-constant method, husbandry.md §2 (computed)
    expect(hatcheryConstant({ fcr: 1.2, dailyLengthGain: 0.04 })).toBeCloseTo(14.4, 10);
    expect(hatcheryConstantRationPct({ fcr: 1.2, dailyLengthGain: 0.04, length: 6 })).toBeCloseTo(2.4, 10);
  });

  it('gives the same ration in centimetres as in inches', () => {
    // unit independence of HC / L (computed)
    const inches = hatcheryConstantRationPct({ fcr: 1.2, dailyLengthGain: 0.04, length: 6 });
    const cm = hatcheryConstantRationPct({ fcr: 1.2, dailyLengthGain: 0.04 * 2.54, length: 6 * 2.54 });
    expect(cm).toBeCloseTo(inches, 12);
  });
});
