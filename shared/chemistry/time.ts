import { ChemistryInputError } from './errors';

/** A moment as callers hold it: an ISO 8601 string, epoch milliseconds or a Date. */
export type TimeInput = string | number | Date;

/** The form of a computed time: the same form as the input it derives from. */
export type SameTimeForm<T extends TimeInput> = T extends string ? string : T extends number ? number : Date;

// Largest span a JavaScript Date can hold (ECMAScript time value limit).
const MAX_EPOCH_MS = 8.64e15;

/** Epoch milliseconds of a TimeInput; throws ChemistryInputError for an unparseable or out-of-range time. */
export function toEpochMs({ field, at }: { field: string; at: TimeInput }): number {
  const ms =
    typeof at === 'number' ? at : typeof at === 'string' ? Date.parse(at) : at instanceof Date ? at.getTime() : NaN;
  if (!Number.isFinite(ms) || Math.abs(ms) > MAX_EPOCH_MS) {
    throw new ChemistryInputError({
      field,
      min: -MAX_EPOCH_MS,
      max: MAX_EPOCH_MS,
      value: at,
      reason: 'an ISO 8601 string, epoch milliseconds or a valid Date',
    });
  }
  return ms;
}

/** Epoch milliseconds written back in the form of `like` (ISO string, epoch ms or Date). */
export function fromEpochMs<T extends TimeInput>({ ms, like }: { ms: number; like: T }): SameTimeForm<T> {
  if (typeof like === 'number') return ms as SameTimeForm<T>;
  if (typeof like === 'string') return new Date(ms).toISOString() as SameTimeForm<T>;
  return new Date(ms) as SameTimeForm<T>;
}
