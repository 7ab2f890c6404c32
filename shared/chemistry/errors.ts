// One error type for every chemistry input that is impossible or outside a method's valid range.
// Callers (HTTP validation, ingest, the UI) can show `message` as is or build their own from the fields.

export class ChemistryInputError extends RangeError {
  override readonly name = 'ChemistryInputError';
  /** Name of the offending input, e.g. `pH` or `series[3].temperatureC`. */
  readonly field: string;
  /** Smallest allowed value (inclusive); -Infinity when there is no lower limit. */
  readonly min: number;
  /** Largest allowed value (inclusive); Infinity when there is no upper limit. */
  readonly max: number;
  /** The value received, unchanged. */
  readonly value: unknown;
  /** Why the range applies, when it is narrower than plain physics (e.g. a method's valid range). */
  readonly reason: string | undefined;

  constructor({
    field,
    min,
    max,
    value,
    reason,
  }: {
    field: string;
    min: number;
    max: number;
    value: unknown;
    reason?: string;
  }) {
    super(
      `${field} must be a finite number ${describeRange(min, max)}${reason ? ` (${reason})` : ''}; got ${describe(value)}`,
    );
    this.field = field;
    this.min = min;
    this.max = max;
    this.value = value;
    this.reason = reason;
  }

  /** The same error for a field nested under `prefix`, e.g. `series[2].` + `pH`. */
  withFieldPrefix(prefix: string): ChemistryInputError {
    return new ChemistryInputError({
      field: `${prefix}${this.field}`,
      min: this.min,
      max: this.max,
      value: this.value,
      reason: this.reason,
    });
  }
}

function describeRange(min: number, max: number): string {
  if (Number.isFinite(min) && Number.isFinite(max)) return `from ${min} to ${max}`;
  if (Number.isFinite(min)) return `of at least ${min}`;
  if (Number.isFinite(max)) return `of at most ${max}`;
  return '';
}

function describe(value: unknown): string {
  if (typeof value === 'string') return JSON.stringify(value);
  if (value instanceof Date) return `Date(${Number.isNaN(value.getTime()) ? 'invalid' : value.toISOString()})`;
  return String(value);
}

/** Returns `value` when it is a finite number within [min, max]; throws ChemistryInputError otherwise. */
export function checkRange({
  field,
  value,
  min,
  max,
  reason,
}: {
  field: string;
  value: number;
  min: number;
  max: number;
  reason?: string;
}): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < min || value > max) {
    throw new ChemistryInputError({ field, min, max, value, reason });
  }
  return value;
}

/** Like checkRange, but the lower bound is exclusive (value must be greater than min). */
export function checkAbove({
  field,
  value,
  min,
  max,
  reason,
}: {
  field: string;
  value: number;
  min: number;
  max: number;
  reason?: string;
}): number {
  checkRange({ field, value, min, max, reason });
  if (value <= min) {
    throw new ChemistryInputError({ field, min, max, value, reason: reason ?? `must be greater than ${min}` });
  }
  return value;
}
