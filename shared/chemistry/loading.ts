// Raceway loading and trout rations by the hatchery rules of thumb in Piper et al. (1982), Fish
// Hatchery Management (husbandry.md §2 and §4). SI units throughout: kg, m³, L/min, cm.
import { ChemistryInputError, checkAbove, checkRange } from './errors';

/** Piper's density index 0.5 lb/(ft³·in) in kg/(m³·cm) (computed). */
export const DEFAULT_DENSITY_INDEX_MAX = 3.153;
/** DO (mg/L) below which trout flow-index capacity is taken as nil; the FI scaling is (DO_in − 5)/(DO_sat − 5). */
export const FLOW_INDEX_DO_FLOOR_MGL = 5;

const positive = (field: string, value: number, max = 1e9): number => checkAbove({ field, value, min: 0, max });

/** Density index DI = W / (V × L), kg/(m³·cm) (Piper et al. 1982). */
export function densityIndex({
  weightKg,
  volumeM3,
  fishLengthCm,
}: {
  weightKg: number;
  volumeM3: number;
  fishLengthCm: number;
}): number {
  checkRange({ field: 'weightKg', value: weightKg, min: 0, max: 1e9 });
  return weightKg / (positive('volumeM3', volumeM3) * positive('fishLengthCm', fishLengthCm, 500));
}

/** Flow index FI = W / (I × L), kg/((L/min)·cm) (Piper et al. 1982). */
export function flowIndex({
  weightKg,
  inflowLpm,
  fishLengthCm,
}: {
  weightKg: number;
  inflowLpm: number;
  fishLengthCm: number;
}): number {
  checkRange({ field: 'weightKg', value: weightKg, min: 0, max: 1e9 });
  return weightKg / (positive('inflowLpm', inflowLpm, 1e6) * positive('fishLengthCm', fishLengthCm, 500));
}

export type RacewayCapacity = {
  /** The lower of the two capacities, kg of fish. */
  capacityKg: number;
  /** Capacity by density index: DI_max × V × L, kg. */
  byDensityKg: number;
  /** Capacity by flow index: FI_max × scaling × I × L, kg. */
  byFlowKg: number;
  /** Which limit governs (ties go to density). */
  governedBy: 'density' | 'flow';
  /** Oxygen scaling applied to the flow index, (DO_in − 5)/(DO_sat − 5) floored at 0; 1 when no DO is given. */
  flowIndexDoScaling: number;
};

/**
 * Raceway carrying capacity by density index and flow index (Piper et al. 1982), the lower governing.
 * With doInMgL and doSatMgL (both or neither) the flow index is scaled by (DO_in − 5)/(DO_sat − 5).
 */
export function racewayCapacityKg({
  volumeM3,
  inflowLpm,
  fishLengthCm,
  densityIndexMax = DEFAULT_DENSITY_INDEX_MAX,
  flowIndexMax,
  doInMgL,
  doSatMgL,
}: {
  volumeM3: number;
  inflowLpm: number;
  fishLengthCm: number;
  /** kg/(m³·cm); default 3.153 = 0.5 lb/(ft³·in). */
  densityIndexMax?: number;
  /** kg/((L/min)·cm); Piper's 1.0–1.5 lb/(gpm·in) is 0.0472–0.0708. */
  flowIndexMax: number;
  doInMgL?: number;
  doSatMgL?: number;
}): RacewayCapacity {
  positive('volumeM3', volumeM3);
  positive('inflowLpm', inflowLpm, 1e6);
  positive('fishLengthCm', fishLengthCm, 500);
  positive('densityIndexMax', densityIndexMax, 100);
  positive('flowIndexMax', flowIndexMax, 10);

  let flowIndexDoScaling = 1;
  if (doInMgL !== undefined || doSatMgL !== undefined) {
    if (doInMgL === undefined || doSatMgL === undefined) {
      throw new RangeError('racewayCapacityKg needs both doInMgL and doSatMgL to scale the flow index, or neither');
    }
    checkRange({ field: 'doInMgL', value: doInMgL, min: 0, max: 40 });
    checkRange({ field: 'doSatMgL', value: doSatMgL, min: FLOW_INDEX_DO_FLOOR_MGL, max: 40 });
    if (doSatMgL === FLOW_INDEX_DO_FLOOR_MGL) {
      throw new ChemistryInputError({
        field: 'doSatMgL',
        min: FLOW_INDEX_DO_FLOOR_MGL,
        max: 40,
        value: doSatMgL,
        reason: 'must exceed 5 mg/L',
      });
    }
    flowIndexDoScaling = Math.max(0, (doInMgL - FLOW_INDEX_DO_FLOOR_MGL) / (doSatMgL - FLOW_INDEX_DO_FLOOR_MGL));
  }

  const byDensityKg = densityIndexMax * volumeM3 * fishLengthCm;
  const byFlowKg = flowIndexMax * flowIndexDoScaling * inflowLpm * fishLengthCm;
  const governedBy = byFlowKg < byDensityKg ? 'flow' : 'density';
  return { capacityKg: Math.min(byDensityKg, byFlowKg), byDensityKg, byFlowKg, governedBy, flowIndexDoScaling };
}

/** Hatchery constant HC = 3 × FCR × ΔL × 100, ΔL the daily length gain (Haskell 1959; Buterbaugh & Willoughby 1967; Piper et al. 1982). */
export function hatcheryConstant({ fcr, dailyLengthGain }: { fcr: number; dailyLengthGain: number }): number {
  positive('fcr', fcr, 20);
  checkRange({ field: 'dailyLengthGain', value: dailyLengthGain, min: 0, max: 100 });
  return 3 * fcr * dailyLengthGain * 100;
}

/** Daily ration, % body weight = HC / L, L and ΔL in the same length unit (hatchery-constant method, Piper et al. 1982). */
export function hatcheryConstantRationPct({
  fcr,
  dailyLengthGain,
  length,
}: {
  fcr: number;
  dailyLengthGain: number;
  length: number;
}): number {
  return hatcheryConstant({ fcr, dailyLengthGain }) / positive('length', length, 1000);
}
