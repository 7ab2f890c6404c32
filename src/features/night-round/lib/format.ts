export function formatNumber(value: number, locale: string, maximumFractionDigits = 1): string {
  return new Intl.NumberFormat(locale, { maximumFractionDigits }).format(value);
}

export function farmClock(at: string | Date, timeZone: string, locale: string): string {
  try {
    return new Intl.DateTimeFormat(locale, { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(at));
  } catch {
    return '';
  }
}

/** "02:14" today, "Mon 23:05" on another day (farm time). */
export function farmWhen(at: string | Date, timeZone: string, locale: string, now = new Date()): string {
  try {
    const day = (d: Date) => new Intl.DateTimeFormat('en-CA', { timeZone }).format(d);
    const sameDay = day(new Date(at)) === day(now);
    return new Intl.DateTimeFormat(locale, {
      timeZone,
      ...(sameDay ? {} : { weekday: 'short' }),
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
    }).format(new Date(at));
  } catch {
    return '';
  }
}
