import { ChemistryInputError, freeAmmonia, type AmmoniaMethod, type AmmoniaReadingBasis } from '@shared/chemistry';
import type { LatestValue } from '@shared/schemas/farms.schema';

/** Where a pH, temperature or salinity used for the result came from. */
export interface WaterValue {
  value: number;
  source: 'probe' | 'handheld' | 'unit_default';
  /** Reading time, for probe values. */
  at?: string;
}

export interface InstantInputs {
  readingMgL: number | undefined;
  basis: string;
  /** The unit's newest probe values (GET …/status `latest`). */
  probe: { ph?: LatestValue | undefined; temperature?: LatestValue | undefined; salinity?: LatestValue | undefined };
  handheld: { ph?: number | undefined; temperatureC?: number | undefined; salinityPpt?: number | undefined };
  defaultSalinityPpt: number;
  sampledAt: Date;
  /** Farm setting: how far from the test a probe reading may be (the worker uses the same window). */
  windowMinutes: number;
  /** Farm setting; undefined = the default rule (Emerson below 0.5 ‰, Khoo above). */
  method?: AmmoniaMethod | undefined;
}

export type InstantResult =
  | {
      status: 'ok';
      tanMgL: number;
      nh3NMgL: number;
      nh3MgL: number;
      fraction: number;
      method: AmmoniaMethod;
      pH: WaterValue;
      temperature: WaterValue;
      salinity: WaterValue;
    }
  | { status: 'no_reading' }
  | { status: 'needs_ph' | 'needs_temperature'; pH: WaterValue | null; temperature: WaterValue | null; salinity: WaterValue }
  | { status: 'out_of_range'; field: string };

const AMMONIA_BASES: readonly string[] = ['tan-n', 'total-nh3', 'total-nh4'];

/** A probe value counts when it is good and inside the window around the sample time — as on the server. */
export function freshProbeValue(value: LatestValue | undefined, sampledAt: Date, windowMinutes: number): WaterValue | null {
  if (!value || value.quality !== 'good') return null;
  const gap = Math.abs(Date.parse(value.at) - sampledAt.getTime());
  if (!(gap <= windowMinutes * 60_000)) return null;
  return { value: value.value, source: 'probe', at: value.at };
}

/**
 * The free ammonia of a kit reading, right now on the phone, with the same shared/chemistry code and
 * the same order of preference as the worker: a fresh probe value, else the handheld value, else (for
 * salinity) the unit's default. The worker's stored result replaces it once it arrives.
 */
export function instantFreeAmmonia(input: InstantInputs): InstantResult {
  if (input.readingMgL === undefined || !AMMONIA_BASES.includes(input.basis)) return { status: 'no_reading' };
  const pick = (probe: LatestValue | undefined, hand: number | undefined): WaterValue | null =>
    freshProbeValue(probe, input.sampledAt, input.windowMinutes) ?? (hand !== undefined ? { value: hand, source: 'handheld' } : null);
  const pH = pick(input.probe.ph, input.handheld.ph);
  const temperature = pick(input.probe.temperature, input.handheld.temperatureC);
  const salinity = pick(input.probe.salinity, input.handheld.salinityPpt) ?? { value: input.defaultSalinityPpt, source: 'unit_default' };
  if (!pH) return { status: 'needs_ph', pH, temperature, salinity };
  if (!temperature) return { status: 'needs_temperature', pH, temperature, salinity };
  try {
    const fa = freeAmmonia({
      readingMgL: input.readingMgL,
      basis: input.basis as AmmoniaReadingBasis,
      pH: pH.value,
      temperatureC: temperature.value,
      salinityPpt: salinity.value,
      ...(input.method ? { method: input.method } : {}),
    });
    return { status: 'ok', ...fa, pH, temperature, salinity };
  } catch (e) {
    if (e instanceof ChemistryInputError) return { status: 'out_of_range', field: e.field };
    if (e instanceof RangeError) return { status: 'out_of_range', field: 'reading' };
    throw e;
  }
}
