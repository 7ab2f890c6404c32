import { localParts, zonedTime } from '@shared/farm-time';
import type { FieldErrors, FieldValues, Resolver } from 'react-hook-form';
import type { z } from 'zod';
import { parseDecimal } from '@/components/ui/field';

/**
 * A react-hook-form resolver: the form's text values → the API body, checked with the shared zod
 * schema (the one the server uses). Each issue lands on the field its path names, typed by its code.
 */
export function schemaResolver<V extends FieldValues, B>(schema: z.ZodType<B>, toBody: (values: V) => unknown): Resolver<V, unknown, B> {
  return (values) => {
    const parsed = schema.safeParse(toBody(values));
    if (parsed.success) return { values: parsed.data, errors: {} };
    const errors: Record<string, { type: string; message: string }> = {};
    for (const issue of parsed.error.issues) {
      const field = typeof issue.path[0] === 'string' ? issue.path[0] : 'root';
      errors[field] ??= { type: issue.code, message: issue.message };
    }
    return { values: {}, errors: errors as FieldErrors<V> };
  };
}

/** "12,5" → 12.5; blank → null; anything else → NaN (refused beside the field). */
export function numberOrNull(v: string | undefined): number | null {
  if (v === undefined || v.trim() === '') return null;
  return parseDecimal(v) ?? Number.NaN;
}

/** "YYYY-MM-DDTHH:MM" as the farm's wall clock → ISO instant; blank → undefined (now). */
export function farmLocalToIso(value: string, timeZone: string): string | undefined {
  const m = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})$/.exec(value.trim());
  if (!m) return value.trim() ? 'invalid' : undefined;
  return zonedTime(m[1]!, Number(m[2]), Number(m[3]), timeZone).toISOString();
}

export function nowFarmLocal(timeZone: string): string {
  const p = localParts(Date.now(), timeZone);
  return `${p.day}T${String(p.hour).padStart(2, '0')}:${String(p.minute).padStart(2, '0')}`;
}
