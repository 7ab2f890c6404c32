import { celsiusToFahrenheit, fahrenheitToCelsius } from '@shared/chemistry';
import type { DisplayPrefs } from '@shared/schemas/auth.schema';
import { createWaterTestSchema, type CreateWaterTest } from '@shared/schemas/water-tests.schema';
import { parseDecimal } from '@/components/ui/field';

export type TemperatureUnit = DisplayPrefs['temperatureUnit'];

/** One pond's entry on tonight's round, as typed (temperature in the user's unit). */
export interface PondEntry {
  doMgL: string;
  temperature: string;
  aeratorOn: boolean;
}

export const emptyPondEntry = (): PondEntry => ({ doMgL: '', temperature: '', aeratorOn: false });

export type NightBody = Omit<CreateWaterTest, 'clientId'>;
export type PondErrors = Partial<Record<'doMgL' | 'temperature' | 'form', string>>;

/** Any valid UUID: the real client id is made when the entry goes into the outbox. */
const PLACEHOLDER_ID = '00000000-0000-4000-8000-000000000000';

export const toCelsius = (v: number, unit: TemperatureUnit) => (unit === 'F' ? fahrenheitToCelsius({ temperatureF: v }) : v);
export const fromCelsius = (c: number, unit: TemperatureUnit) => (unit === 'F' ? celsiusToFahrenheit({ temperatureC: c }) : c);

/**
 * Tonight's entry for one pond → one dissolved-oxygen test and/or one temperature test, stamped now,
 * validated with the shared schema (the API runs the same). The error codes name what is wrong.
 */
export function nightBodies(entry: PondEntry, unit: TemperatureUnit, now: Date): { bodies: NightBody[]; errors: Record<string, string> } {
  const bodies: NightBody[] = [];
  const errors: Record<string, string> = {};
  const sampledAt = now.toISOString();
  const common = { method: 'meter' as const, sampledAt, aeratorOn: entry.aeratorOn, source: 'night_round' as const };
  const add = (field: 'doMgL' | 'temperature', body: Record<string, unknown>) => {
    const parsed = createWaterTestSchema.safeParse({ ...body, clientId: PLACEHOLDER_ID });
    if (!parsed.success) {
      errors[field] = parsed.error.issues[0]?.code ?? 'invalid';
      return;
    }
    const { clientId: _ignored, ...rest } = parsed.data;
    void _ignored;
    bodies.push(rest);
  };
  if (entry.doMgL.trim())
    add('doMgL', { ...common, analyte: 'dissolved_oxygen', basis: 'mg-l', value: parseDecimal(entry.doMgL) ?? Number.NaN });
  if (entry.temperature.trim()) {
    const t = parseDecimal(entry.temperature);
    add('temperature', { ...common, analyte: 'temperature', basis: 'c', value: t === undefined ? Number.NaN : toCelsius(t, unit) });
  }
  if (!entry.doMgL.trim() && !entry.temperature.trim()) errors.form = 'empty';
  return { bodies: Object.keys(errors).length ? [] : bodies, errors };
}
