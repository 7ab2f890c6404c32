import type { DisplayPrefs } from '@shared/schemas/auth.schema';

/** A number in the reader's language, with a fixed number of decimals. */
export function formatNumber(value: number, decimals: number, locale: string): string {
  return new Intl.NumberFormat(locale, { minimumFractionDigits: decimals, maximumFractionDigits: decimals }).format(value);
}

function dayKey(d: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(d);
}

/** Farm-local wall-clock time; the date too when it is not the farm's today. */
export function formatFarmTime(iso: string, timeZone: string, locale: string, now: Date = new Date()): string {
  const d = new Date(iso);
  const sameDay = dayKey(d, timeZone) === dayKey(now, timeZone);
  return new Intl.DateTimeFormat(locale, {
    timeZone,
    hour: '2-digit',
    hourCycle: 'h23',
    minute: '2-digit',
    ...(sameDay ? {} : { day: 'numeric', month: 'short' }),
  }).format(d);
}

export function temperatureIn(valueC: number, unit: DisplayPrefs['temperatureUnit']): number {
  return unit === 'F' ? (valueC * 9) / 5 + 32 : valueC;
}
