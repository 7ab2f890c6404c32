// Gillwise water-chemistry core: pure, isomorphic functions (no Node or DOM APIs).
// Methods, sources and labels: docs/science.md.
export { ChemistryInputError } from './errors';
export type { SameTimeForm, TimeInput } from './time';
export {
  type AmmoniaMethod,
  type AmmoniaMethodInfo,
  type AmmoniaReadingBasis,
  type ForecastPoint,
  type FreeAmmoniaResult,
  type PeakNh3Forecast,
  type PhScale,
  type UnionizedFractionResult,
  SALINE_DEFAULT_FROM_PPT,
  ammoniaMethodInfo,
  ammoniaMethods,
  defaultAmmoniaMethod,
  forecastPeakNh3,
  freeAmmonia,
  ionicStrengthFromSalinity,
  tanFromReadingMgL,
  unionizedFraction,
} from './ammonia';
export { type Epa2013Criteria, EPA2013_RANGE, epa2013Criteria } from './epa-criteria';
export {
  C35_15_0_MS_CM,
  practicalSalinity,
  salinityFromConductivity,
  salinityFromSpecificConductance,
} from './salinity';
export { oxygenPercentSaturation, oxygenSaturationMgL, oxygenSolubilityUmolKg } from './oxygen';
export { TAN_PER_KG_PROTEIN, maxFeedKgPerDay, racewayTanRiseMgL, tanProductionKgPerDay } from './feed-load';
export { type DawnOxygenProjection, type DawnProjection, type DoReading, projectDawnOxygen } from './dawn-oxygen';
export {
  type RacewayCapacity,
  DEFAULT_DENSITY_INDEX_MAX,
  FLOW_INDEX_DO_FLOOR_MGL,
  densityIndex,
  flowIndex,
  hatcheryConstant,
  hatcheryConstantRationPct,
  racewayCapacityKg,
} from './loading';
export {
  type ChlorideNitriteCheck,
  type NitriteBasis,
  NACL_PER_CHLORIDE,
  chlorideNitriteRatio,
  freeCo2MgL,
  saltToRaiseChlorideKg,
} from './water-quality';
export { PH_ELECTRODE_LIMITS, nernstSlopeMvPerPh, phElectrodeSlope } from './ph-electrode';
export * from '../units';
