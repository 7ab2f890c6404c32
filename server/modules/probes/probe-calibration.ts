import { PH_ELECTRODE_LIMITS, phElectrodeSlope } from '../../../shared/chemistry';
import type { CreateCalibrationRequest } from '../../../shared/schemas/probes.schema';
import { validationError } from '../../http/errors';

const DAY = 86_400_000;
/** Continuous probes are recalibrated monthly (husbandry.md §5, common practice). */
export const CALIBRATION_INTERVAL_DAYS = 30;
/** A check buffer must read within ±0.1 pH; conductivity standards within ±3 % (husbandry.md §5, published practice). */
export const PH_CHECK_TOLERANCE = 0.1;
export const CONDUCTIVITY_TOLERANCE_PCT = 3;

const round = (v: number, d: number) => Math.round(v * 10 ** d) / 10 ** d;

export type CalibrationOutcome = { method: string; details: Record<string, unknown>; passed: boolean; performedAt: Date; nextDueAt: Date };

/**
 * Judges a calibration record. pH: slope and offset from the two buffers (phElectrodeSlope, shared/
 * chemistry), pass when the slope is 95–105 % of Nernst, the offset within ±30 mV and the check buffer
 * (if any) within ±0.1 pH. Conductivity and salinity: the standard read within ±3 %. Others: as recorded.
 * A failed calibration is due again at once, a passed one after 30 days unless `nextDueAt` is given.
 */
export function assessCalibration(input: CreateCalibrationRequest, now: Date = new Date()): CalibrationOutcome {
  const performedAt = input.performedAt ? new Date(input.performedAt) : now;
  if (performedAt.getTime() > now.getTime() + 5 * 60_000) {
    throw validationError({ formErrors: [], fieldErrors: { performedAt: ['cannot be in the future'] } });
  }
  let method: string;
  let details: Record<string, unknown>;
  let passed: boolean;
  if (input.quantity === 'ph') {
    const [b1, b2] = input.buffers;
    let slope: ReturnType<typeof phElectrodeSlope>;
    try {
      slope = phElectrodeSlope({ mV1: b1.mV, pH1: b1.pH, mV2: b2.mV, pH2: b2.pH, temperatureC: input.temperatureC });
    } catch (err) {
      throw validationError({ formErrors: [], fieldErrors: { buffers: [err instanceof Error ? err.message : 'buffers not usable'] } });
    }
    const checkError = input.check ? round(input.check.readPh - input.check.bufferPh, 3) : null;
    const checkOk = checkError === null || Math.abs(checkError) <= PH_CHECK_TOLERANCE + 1e-9;
    const failures = [
      ...(slope.slopePct < PH_ELECTRODE_LIMITS.slopePct.min || slope.slopePct > PH_ELECTRODE_LIMITS.slopePct.max
        ? ['slope outside 95–105 % of Nernst']
        : []),
      ...(slope.offsetMv < PH_ELECTRODE_LIMITS.offsetMv.min || slope.offsetMv > PH_ELECTRODE_LIMITS.offsetMv.max
        ? ['offset outside ±30 mV']
        : []),
      ...(checkOk ? [] : [`check buffer read ${checkError} pH off (limit ±${PH_CHECK_TOLERANCE})`]),
    ];
    passed = slope.ok && checkOk;
    method =
      input.method ??
      `two-buffer (${b1.pH.toFixed(2)}, ${b2.pH.toFixed(2)})${input.check ? ` + check buffer ${input.check.bufferPh.toFixed(2)}` : ''}`;
    details = {
      buffers: input.buffers,
      temperatureC: input.temperatureC,
      slopePct: round(slope.slopePct, 1),
      offsetMv: round(slope.offsetMv, 1),
      limits: PH_ELECTRODE_LIMITS,
      ...(input.check ? { check: { ...input.check, errorPh: checkError, tolerancePh: PH_CHECK_TOLERANCE } } : {}),
      failures,
    };
  } else if ('standard' in input) {
    const errorPct = round(((input.reading - input.standard) / input.standard) * 100, 2);
    passed = Math.abs(errorPct) <= CONDUCTIVITY_TOLERANCE_PCT;
    method = input.method ?? 'standard solution';
    details = { standard: input.standard, reading: input.reading, errorPct, tolerancePct: CONDUCTIVITY_TOLERANCE_PCT };
  } else {
    passed = input.passed;
    method = input.method ?? (input.quantity === 'dissolved_oxygen' ? 'air calibration' : 'manual check');
    details = { ...input.details };
  }
  const nextDueAt = input.nextDueAt
    ? new Date(input.nextDueAt)
    : passed
      ? new Date(performedAt.getTime() + CALIBRATION_INTERVAL_DAYS * DAY)
      : performedAt;
  return { method, details, passed, performedAt, nextDueAt };
}
