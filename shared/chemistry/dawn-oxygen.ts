// Projection of the night's dissolved-oxygen decline to dawn (husbandry.md §1).
//
// Times: every `at` and `dawnAt` may be an ISO 8601 string, epoch milliseconds or a Date; they
// are compared as epoch milliseconds. A computed time (`crossesAt`) is returned in the same form
// as `dawnAt` was given, rounded to the millisecond. `readingsUsed` holds the caller's own reading
// objects, oldest first.
import { physicalLimits } from '../units';
import { ChemistryInputError, checkAbove } from './errors';
import { type SameTimeForm, type TimeInput, fromEpochMs, toEpochMs } from './time';

export type DoReading<T extends TimeInput = TimeInput> = { at: T; doMgL: number };

export type DawnProjection<D extends TimeInput> = {
  /** Projected DO at dawn, mg/L (never below 0). */
  doAtDawnMgL: number;
  /** When the projection reaches the threshold, or null if it stays above it until dawn. */
  crossesAt: SameTimeForm<D> | null;
};

export type DawnOxygenProjection<D extends TimeInput, R extends DoReading> = {
  /** Straight line (Boyd, Romaire & Johnston 1978): the conservative bound. */
  linear: DawnProjection<D>;
  /** Exponential decline (Madenjian, Rogers & Fast 1987). */
  logLinear: DawnProjection<D>;
  /** Which projection is lower at dawn (ties go to linear); alarm on this one. */
  lower: 'linear' | 'logLinear';
  /** The lower of the two projected dawn values, mg/L. */
  doAtDawnMgL: number;
  readingsUsed: R[];
};

const HOUR_MS = 3_600_000;
const DO_RANGE = { min: physicalLimits.dissolved_oxygen.min, max: physicalLimits.dissolved_oxygen.max } as const;

// Least-squares line y = a + b·x; with two points it is the line through both.
function fitLine(xs: readonly number[], ys: readonly number[]): { a: number; b: number } {
  const n = xs.length;
  const meanX = xs.reduce((s, x) => s + x, 0) / n;
  const meanY = ys.reduce((s, y) => s + y, 0) / n;
  let sxy = 0;
  let sxx = 0;
  xs.forEach((x, i) => {
    sxy += (x - meanX) * ((ys[i] ?? 0) - meanY);
    sxx += (x - meanX) ** 2;
  });
  const b = sxy / sxx;
  return { a: meanY - b * meanX, b };
}

/**
 * Dawn DO by two projections of the readings since dusk: linear (Boyd, Romaire & Johnston 1978,
 * procedure in UF/IFAS FA27; published) and log-linear (Madenjian, Rogers & Fast 1987; form from
 * memory). Two readings give the two-point forms; more readings are fitted by least squares (on DO
 * and on ln DO). Pass `duskAt` to drop readings taken before dusk.
 */
export function projectDawnOxygen<D extends TimeInput, R extends DoReading>({
  readings,
  dawnAt,
  thresholdMgL,
  duskAt,
}: {
  readings: readonly R[];
  dawnAt: D;
  thresholdMgL: number;
  duskAt?: TimeInput;
}): DawnOxygenProjection<D, R> {
  checkAbove({ field: 'thresholdMgL', value: thresholdMgL, ...DO_RANGE });
  const dawnMs = toEpochMs({ field: 'dawnAt', at: dawnAt });
  const duskMs = duskAt === undefined ? Number.NEGATIVE_INFINITY : toEpochMs({ field: 'duskAt', at: duskAt });

  const timed = readings.map((reading, i) => {
    const ms = toEpochMs({ field: `readings[${i}].at`, at: reading.at });
    // ln DO needs DO above zero; a reading of 0 means the pond is already anoxic, not a projection.
    checkAbove({
      field: `readings[${i}].doMgL`,
      value: reading.doMgL,
      ...DO_RANGE,
      reason: 'the log-linear projection needs DO above 0',
    });
    return { reading, ms };
  });
  const used = timed.filter(({ ms }) => ms >= duskMs).sort((p, q) => p.ms - q.ms);
  const first = used[0];
  const last = used[used.length - 1];
  if (!first || !last || last.ms === first.ms) {
    throw new RangeError('projectDawnOxygen needs at least two readings taken at different times since dusk');
  }
  if (dawnMs < first.ms) {
    throw new ChemistryInputError({
      field: 'dawnAt',
      min: first.ms,
      max: Number.POSITIVE_INFINITY,
      value: dawnAt,
      reason: 'dawn must not precede the first reading',
    });
  }

  // Hours since the first reading keep the fit well conditioned.
  const hours = used.map(({ ms }) => (ms - first.ms) / HOUR_MS);
  const dawnH = (dawnMs - first.ms) / HOUR_MS;
  const line = fitLine(
    hours,
    used.map(({ reading }) => reading.doMgL),
  );
  const logLine = fitLine(
    hours,
    used.map(({ reading }) => Math.log(reading.doMgL)),
  );

  const project = (valueAt: (h: number) => number, hoursToThreshold: () => number): DawnProjection<D> => {
    const atDawn = valueAt(dawnH);
    let crossesAt: SameTimeForm<D> | null = null;
    if (valueAt(0) <= thresholdMgL) crossesAt = fromEpochMs({ ms: first.ms, like: dawnAt });
    else if (atDawn <= thresholdMgL)
      crossesAt = fromEpochMs({ ms: Math.round(first.ms + hoursToThreshold() * HOUR_MS), like: dawnAt });
    return { doAtDawnMgL: Math.max(0, atDawn), crossesAt };
  };

  const linear = project(
    (h) => line.a + line.b * h,
    () => (thresholdMgL - line.a) / line.b,
  );
  const logLinear = project(
    (h) => Math.exp(logLine.a + logLine.b * h),
    () => (Math.log(thresholdMgL) - logLine.a) / logLine.b,
  );
  const lower = logLinear.doAtDawnMgL < linear.doAtDawnMgL ? 'logLinear' : 'linear';
  return {
    linear,
    logLinear,
    lower,
    doAtDawnMgL: Math.min(linear.doAtDawnMgL, logLinear.doAtDawnMgL),
    readingsUsed: used.map(({ reading }) => reading),
  };
}
