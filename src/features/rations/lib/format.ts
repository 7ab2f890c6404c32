/** A number in the reader's language with a fixed number of decimals. */
export function fmt(value: number, decimals: number, locale: string): string {
  return new Intl.NumberFormat(locale, { minimumFractionDigits: decimals, maximumFractionDigits: decimals }).format(value);
}

/** Kilograms of feed: one decimal below 1,000 kg (as the rule rounds them), whole kilograms above. */
export function fmtKg(value: number, locale: string): string {
  return fmt(value, Math.abs(value) < 1000 ? 1 : 0, locale);
}

/** Free ammonia in mg/L: three decimals (levels of interest start at 0.02). */
export function fmtNh3(value: number, locale: string): string {
  return fmt(value, 3, locale);
}

/** A farm-local clock time of an instant, e.g. "15:29" (with the day when it is not `day`). */
export function farmClock(iso: string, timeZone: string, locale: string, day?: string): string {
  const at = new Date(iso);
  const dayOf = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(at);
  const time = new Intl.DateTimeFormat(locale, { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(at);
  if (!day || dayOf === day) return time;
  const date = new Intl.DateTimeFormat(locale, { timeZone, day: 'numeric', month: 'short' }).format(at);
  return `${date} ${time}`;
}

/** YYYY-MM-DD plus n days (calendar arithmetic in UTC). */
export function addDays(day: string, n: number): string {
  const [y, m, d] = day.split('-').map(Number) as [number, number, number];
  return new Date(Date.UTC(y, m - 1, d + n)).toISOString().slice(0, 10);
}

/** A farm-local day written out ("Tuesday 1 December"). */
export function formatDay(day: string, locale: string, withYear = false): string {
  const [y, m, d] = day.split('-').map(Number) as [number, number, number];
  return new Intl.DateTimeFormat(locale, {
    timeZone: 'UTC',
    weekday: 'long',
    day: 'numeric',
    month: 'long',
    year: withYear ? 'numeric' : undefined,
  }).format(new Date(Date.UTC(y, m - 1, d)));
}

export function isDay(v: unknown): v is string {
  return typeof v === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(v);
}
