export function fmt(value: number, decimals: number, locale: string): string {
  return new Intl.NumberFormat(locale, { minimumFractionDigits: decimals, maximumFractionDigits: decimals }).format(value);
}

/** A number with a sensible precision for its size. */
export function fmtAuto(value: number, locale: string): string {
  const a = Math.abs(value);
  return fmt(value, a >= 1000 ? 0 : a >= 10 ? 1 : 2, locale);
}

export function farmDate(iso: string, timeZone: string, locale: string): string {
  return new Intl.DateTimeFormat(locale, { timeZone, day: 'numeric', month: 'short', year: 'numeric' }).format(new Date(iso));
}

export function farmDateTime(iso: string, timeZone: string, locale: string): string {
  return new Intl.DateTimeFormat(locale, {
    timeZone,
    day: 'numeric',
    month: 'short',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  }).format(new Date(iso));
}

export function speciesName(s: string | null): string {
  return s ? s.replace(/_/g, ' ') : '';
}
