// Unit conversions and the physical limits used to reject impossible probe values.
// Pure and isomorphic. Every conversion takes one object argument whose key names the unit it
// receives, and returns a plain number in the unit its name ends with.
//
// Conversion factors (docs/science.md; water-chemistry.md §7): the nitrogen-species factors are
// computed from molar masses (N 14.0067, H 1.00794, O 15.9994); the rest are exact definitions
// unless a comment says otherwise.
import { checkRange } from './chemistry/errors';
import type { Quantity, quantityUnits } from './schemas/mqtt.schema';

/** NH3 / N molar-mass ratio (computed). */
export const NH3_PER_NH3_N = 1.21588;
/** NH4+ / N molar-mass ratio (computed). */
export const NH4_PER_NH4_N = 1.28785;
/** NO2- / N molar-mass ratio (computed). */
export const NO2_PER_NO2_N = 3.28454;
/** NO3- / N molar-mass ratio (computed). */
export const NO3_PER_NO3_N = 4.4268;
/** mg/L CaCO3 per meq/L of alkalinity: half the molar mass of CaCO3 (computed). */
export const CACO3_MG_PER_MEQ = 50.04;
/** mg O2 per mL O2 at STP (from memory). */
export const O2_MG_PER_ML = 1.42905;
/** Litres in one US gallon (exact). */
export const LITRES_PER_US_GALLON = 3.785411784;
/** Kilograms in one avoirdupois pound (exact). */
export const KG_PER_LB = 0.45359237;
/** Centimetres in one inch (exact). */
export const CM_PER_INCH = 2.54;
/** Cubic metres in one cubic foot (exact: 0.3048³). */
export const M3_PER_FT3 = 0.3048 ** 3;

const concentration = (field: string, value: number): number =>
  checkRange({ field, value, min: 0, max: Number.POSITIVE_INFINITY, reason: 'a concentration cannot be negative' });
const finite = (field: string, value: number): number =>
  checkRange({ field, value, min: Number.NEGATIVE_INFINITY, max: Number.POSITIVE_INFINITY });
const nonNegative = (field: string, value: number): number =>
  checkRange({ field, value, min: 0, max: Number.POSITIVE_INFINITY });

// --- nitrogen species: "as N" ↔ whole ion/molecule ---
export const nh3NToNh3MgL = ({ nh3NMgL }: { nh3NMgL: number }): number =>
  concentration('nh3NMgL', nh3NMgL) * NH3_PER_NH3_N;
export const nh3ToNh3NMgL = ({ nh3MgL }: { nh3MgL: number }): number => concentration('nh3MgL', nh3MgL) / NH3_PER_NH3_N;
export const nh4NToNh4MgL = ({ nh4NMgL }: { nh4NMgL: number }): number =>
  concentration('nh4NMgL', nh4NMgL) * NH4_PER_NH4_N;
export const nh4ToNh4NMgL = ({ nh4MgL }: { nh4MgL: number }): number => concentration('nh4MgL', nh4MgL) / NH4_PER_NH4_N;
export const no2NToNo2MgL = ({ no2NMgL }: { no2NMgL: number }): number =>
  concentration('no2NMgL', no2NMgL) * NO2_PER_NO2_N;
export const no2ToNo2NMgL = ({ no2MgL }: { no2MgL: number }): number => concentration('no2MgL', no2MgL) / NO2_PER_NO2_N;
export const no3NToNo3MgL = ({ no3NMgL }: { no3NMgL: number }): number =>
  concentration('no3NMgL', no3NMgL) * NO3_PER_NO3_N;
export const no3ToNo3NMgL = ({ no3MgL }: { no3MgL: number }): number => concentration('no3MgL', no3MgL) / NO3_PER_NO3_N;

// --- temperature ---
export const celsiusToFahrenheit = ({ temperatureC }: { temperatureC: number }): number =>
  (finite('temperatureC', temperatureC) * 9) / 5 + 32;
export const fahrenheitToCelsius = ({ temperatureF }: { temperatureF: number }): number =>
  ((finite('temperatureF', temperatureF) - 32) * 5) / 9;

// --- salinity: parts per thousand and practical salinity units are treated as equal for farm use.
// (Strictly, PSS-78 salinity is a dimensionless conductivity ratio scale and differs from absolute
// salinity in g/kg by about 0.5 % in seawater; no farm decision depends on that difference.)
export const pptToPsu = ({ salinityPpt }: { salinityPpt: number }): number => concentration('salinityPpt', salinityPpt);
export const psuToPpt = ({ salinityPsu }: { salinityPsu: number }): number => concentration('salinityPsu', salinityPsu);

// --- mg/L ↔ ppm: equal in fresh water (density ≈ 1 kg/L); not exact in seawater (about 2.5 % off at 35 ‰).
export const mgLToPpm = ({ mgL }: { mgL: number }): number => concentration('mgL', mgL);
export const ppmToMgL = ({ ppm }: { ppm: number }): number => concentration('ppm', ppm);

// --- flow ---
export const gpmToLpm = ({ flowGpm }: { flowGpm: number }): number =>
  nonNegative('flowGpm', flowGpm) * LITRES_PER_US_GALLON;
export const lpmToGpm = ({ flowLpm }: { flowLpm: number }): number =>
  nonNegative('flowLpm', flowLpm) / LITRES_PER_US_GALLON;
export const m3PerHourToLpm = ({ flowM3PerHour }: { flowM3PerHour: number }): number =>
  (nonNegative('flowM3PerHour', flowM3PerHour) * 1000) / 60;
export const lpmToM3PerHour = ({ flowLpm }: { flowLpm: number }): number =>
  (nonNegative('flowLpm', flowLpm) * 60) / 1000;

// --- alkalinity and oxygen ---
export const alkalinityMeqLToMgLCaCO3 = ({ alkalinityMeqL }: { alkalinityMeqL: number }): number =>
  concentration('alkalinityMeqL', alkalinityMeqL) * CACO3_MG_PER_MEQ;
export const alkalinityMgLCaCO3ToMeqL = ({ alkalinityMgLCaCO3 }: { alkalinityMgLCaCO3: number }): number =>
  concentration('alkalinityMgLCaCO3', alkalinityMgLCaCO3) / CACO3_MG_PER_MEQ;
export const oxygenMlLToMgL = ({ oxygenMlL }: { oxygenMlL: number }): number =>
  concentration('oxygenMlL', oxygenMlL) * O2_MG_PER_ML;
export const oxygenMgLToMlL = ({ oxygenMgL }: { oxygenMgL: number }): number =>
  concentration('oxygenMgL', oxygenMgL) / O2_MG_PER_ML;

// --- conductivity and length (probe units) ---
export const microSiemensToMilliSiemensPerCm = ({ conductivityUsCm }: { conductivityUsCm: number }): number =>
  nonNegative('conductivityUsCm', conductivityUsCm) / 1000;
export const milliSiemensToMicroSiemensPerCm = ({ conductivityMsCm }: { conductivityMsCm: number }): number =>
  nonNegative('conductivityMsCm', conductivityMsCm) * 1000;
export const cmToM = ({ lengthCm }: { lengthCm: number }): number => finite('lengthCm', lengthCm) / 100;
export const mToCm = ({ lengthM }: { lengthM: number }): number => finite('lengthM', lengthM) * 100;

// --- US customary units used by hatchery rules of thumb (Piper et al. 1982) ---
export const inchToCm = ({ lengthIn }: { lengthIn: number }): number => finite('lengthIn', lengthIn) * CM_PER_INCH;
export const cmToInch = ({ lengthCm }: { lengthCm: number }): number => finite('lengthCm', lengthCm) / CM_PER_INCH;
export const lbToKg = ({ massLb }: { massLb: number }): number => finite('massLb', massLb) * KG_PER_LB;
export const kgToLb = ({ massKg }: { massKg: number }): number => finite('massKg', massKg) / KG_PER_LB;
export const ft3ToM3 = ({ volumeFt3 }: { volumeFt3: number }): number =>
  nonNegative('volumeFt3', volumeFt3) * M3_PER_FT3;
export const m3ToFt3 = ({ volumeM3 }: { volumeM3: number }): number => nonNegative('volumeM3', volumeM3) / M3_PER_FT3;

// --- probe units → canonical unit (the first unit listed for each quantity in shared/schemas/mqtt.schema.ts) ---
type UnitOf<Q extends Quantity> = (typeof quantityUnits)[Q][number];
type ToCanonical = { [Q in Quantity]: Record<UnitOf<Q>, (value: number) => number> };

const toCanonical: ToCanonical = {
  ph: { pH: (v) => v },
  water_temperature: { C: (v) => v, F: (v) => ((v - 32) * 5) / 9 },
  salinity: { ppt: (v) => v, psu: (v) => v },
  conductivity: { 'mS/cm': (v) => v, 'uS/cm': (v) => v / 1000 },
  specific_conductance: { 'mS/cm': (v) => v, 'uS/cm': (v) => v / 1000 },
  dissolved_oxygen: { 'mg/L': (v) => v },
  flow: { 'L/min': (v) => v, 'm3/h': (v) => (v * 1000) / 60, gpm: (v) => v * LITRES_PER_US_GALLON },
  water_level: { m: (v) => v, cm: (v) => v / 100 },
  aerator_running: { bool: (v) => v },
  pump_running: { bool: (v) => v },
};

/** Converts a probe value to its quantity's canonical unit; throws RangeError for a unit the quantity does not allow. */
export function toCanonicalUnit({
  quantity,
  value,
  unit,
}: {
  quantity: Quantity;
  value: number;
  unit: string;
}): number {
  const table: Record<string, (value: number) => number> = toCanonical[quantity];
  const convert = Object.hasOwn(table, unit) ? table[unit] : undefined;
  if (!convert) throw new RangeError(`unit ${JSON.stringify(unit)} is not allowed for ${quantity}`);
  return convert(finite('value', value));
}

// --- physical limits: values outside these cannot come from a working probe in fish-farm water ---
export type PhysicalLimit = {
  /** Smallest possible value, inclusive, in `unit`. */
  min: number;
  /** Largest possible value, in `unit`; inclusive unless `maxExclusive`. */
  max: number;
  maxExclusive?: boolean;
  /** Canonical unit the limit is written in. */
  unit: string;
  /** Only 0 and 1 are possible (boolean states). */
  integer?: boolean;
};

// Limits are product decisions (common practice, no source) except the pH scale (0–14) and the
// salinity range of the chemistry methods (0–45, see chemistryLimits). Keys match mqtt.schema.ts;
// `satisfies` makes the type check fail if the schema gains or renames a quantity.
export const physicalLimits = {
  ph: { min: 0, max: 14, unit: 'pH' },
  water_temperature: { min: -5, max: 50, unit: 'C' },
  salinity: { min: 0, max: 70, unit: 'ppt' }, // probes may read brines; chemistry accepts 0–45
  conductivity: { min: 0, max: 100, unit: 'mS/cm' },
  specific_conductance: { min: 0, max: 100, unit: 'mS/cm' },
  dissolved_oxygen: { min: 0, max: 40, unit: 'mg/L' }, // ~4× air saturation: pure-oxygen systems stay below
  flow: { min: 0, max: 1e6, maxExclusive: true, unit: 'L/min' },
  water_level: { min: 0, max: 30, unit: 'm' }, // depth of water above the sensor
  aerator_running: { min: 0, max: 1, integer: true, unit: 'bool' },
  pump_running: { min: 0, max: 1, integer: true, unit: 'bool' },
} as const satisfies Record<Quantity, PhysicalLimit>;

/** Ranges within which Gillwise's chemistry functions accept inputs (water-chemistry.md). */
export const chemistryLimits = {
  pH: { min: 0, max: 14 },
  salinityPpt: { min: 0, max: 45 },
} as const;

/**
 * The largest change per minute a real probe in a farm unit can show (common practice, no source;
 * product decisions). A change of at least this much within one minute (or at this rate over a
 * longer gap) marks a reading implausible, e.g. a pH jump of 2 units in a minute. Infinity means
 * any step is possible (pumps and aerators switch instantly).
 */
export const plausibleStepPerMinute = {
  ph: 2,
  water_temperature: 3,
  salinity: 5,
  conductivity: 8,
  specific_conductance: 8,
  dissolved_oxygen: 5,
  flow: Number.POSITIVE_INFINITY,
  water_level: 0.5,
  aerator_running: Number.POSITIVE_INFINITY,
  pump_running: Number.POSITIVE_INFINITY,
} as const satisfies Record<Quantity, number>;

/** True when `value` (in the canonical unit) lies within the quantity's physical limits. */
export function isPhysicallyPossible({ quantity, value }: { quantity: Quantity; value: number }): boolean {
  const limit: PhysicalLimit = physicalLimits[quantity];
  if (typeof value !== 'number' || !Number.isFinite(value) || value < limit.min) return false;
  if (limit.maxExclusive ? value >= limit.max : value > limit.max) return false;
  return limit.integer ? value === 0 || value === 1 : true;
}

/**
 * True when the change from `previousValue` to `value` over `elapsedMinutes` is physically plausible.
 * Gaps shorter than one minute are judged against the one-minute step, so sensor noise over a few
 * seconds is not inflated into a huge rate.
 */
export function isPlausibleStep({
  quantity,
  previousValue,
  value,
  elapsedMinutes,
}: {
  quantity: Quantity;
  previousValue: number;
  value: number;
  elapsedMinutes: number;
}): boolean {
  const step = plausibleStepPerMinute[quantity];
  if (!Number.isFinite(previousValue) || !Number.isFinite(value) || !(elapsedMinutes >= 0)) return false;
  if (step === Number.POSITIVE_INFINITY) return true;
  return Math.abs(value - previousValue) < step * Math.max(elapsedMinutes, 1);
}
