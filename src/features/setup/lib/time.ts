import { localParts, zonedTime } from '@shared/farm-time';

/** "YYYY-MM-DDTHH:MM" read as a wall-clock time on the farm → ISO instant; null when not a time. */
export function farmLocalToIso(value: string, timeZone: string): string | null {
  const m = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})$/.exec(value.trim());
  if (!m) return null;
  return zonedTime(m[1]!, Number(m[2]), Number(m[3]), timeZone).toISOString();
}

/** An instant as the farm's wall clock, for a datetime-local field. */
export function isoToFarmLocal(at: Date | number, timeZone: string): string {
  const p = localParts(at, timeZone);
  return `${p.day}T${String(p.hour).padStart(2, '0')}:${String(p.minute).padStart(2, '0')}`;
}

export function farmDateTime(iso: string, timeZone: string, locale: string): string {
  return new Intl.DateTimeFormat(locale, {
    timeZone,
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  }).format(new Date(iso));
}

export function farmDate(iso: string, timeZone: string, locale: string): string {
  return new Intl.DateTimeFormat(locale, { timeZone, day: 'numeric', month: 'short', year: 'numeric' }).format(new Date(iso));
}
