import type { FieldErrors, FieldValues, Resolver } from 'react-hook-form';
import type { z } from 'zod';
import { parseDecimal } from '@/components/ui/field';

/**
 * A react-hook-form resolver that turns the form's text values into the API body and checks that with
 * the shared zod schema — the same schema the server checks. Each issue lands on the form field its
 * path names (`fieldOf`), with the zod issue code as its type (lib/form-errors turns it into words).
 */
export function schemaResolver<V extends FieldValues, B>(
  schema: z.ZodType<B>,
  toBody: (values: V) => unknown,
  fieldOf: (path: readonly PropertyKey[]) => string | null = (path) => (typeof path[0] === 'string' ? path[0] : null),
): Resolver<V, unknown, B> {
  return (values) => {
    const parsed = schema.safeParse(toBody(values));
    if (parsed.success) return { values: parsed.data, errors: {} };
    const errors: Record<string, { type: string; message: string }> = {};
    for (const issue of parsed.error.issues) {
      const field = fieldOf(issue.path) ?? 'root';
      if (!errors[field]) errors[field] = { type: issue.code, message: issue.message };
    }
    return { values: {}, errors: errors as FieldErrors<V> };
  };
}

/** "12,5" → 12.5; blank → null; not a number → NaN (so the schema refuses it beside the field). */
export function numberOrNull(v: string | undefined): number | null {
  if (v === undefined || v.trim() === '') return null;
  return parseDecimal(v) ?? Number.NaN;
}

export function textOrNull(v: string | undefined): string | null {
  const s = (v ?? '').trim();
  return s ? s : null;
}

export function numberText(v: number | null | undefined): string {
  return v === null || v === undefined ? '' : String(v);
}
