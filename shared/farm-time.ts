// Farm-local time helpers (isomorphic, Intl only). "Today", daily tests, rations and reports are all
// in the farm's local day.

const partsCache = new Map<string, Intl.DateTimeFormat>();
function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = partsCache.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-CA', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
      weekday: 'short',
    });
    partsCache.set(timeZone, f);
  }
  return f;
}

export type LocalParts = { day: string; hour: number; minute: number; second: number; weekday: number };

const WEEKDAYS: Record<string, number> = { Mon: 1, Tue: 2, Wed: 3, Thu: 4, Fri: 5, Sat: 6, Sun: 7 };

/** The local calendar day (YYYY-MM-DD), time and ISO weekday (1 = Monday) of an instant in a time zone. */
export function localParts(at: Date | number, timeZone: string): LocalParts {
  const parts = Object.fromEntries(formatter(timeZone).formatToParts(new Date(at)).map((p) => [p.type, p.value]));
  return {
    day: `${parts.year}-${parts.month}-${parts.day}`,
    hour: Number(parts.hour),
    minute: Number(parts.minute),
    second: Number(parts.second),
    weekday: WEEKDAYS[parts.weekday ?? 'Mon'] ?? 1,
  };
}

export const localDay = (at: Date | number, timeZone: string): string => localParts(at, timeZone).day;

/** The instant at which the wall clock in `timeZone` shows `day` `hh:mm` (DST gaps resolve forward). */
export function zonedTime(day: string, hour: number, minute: number, timeZone: string): Date {
  const [y, m, d] = day.split('-').map(Number) as [number, number, number];
  const guess = Date.UTC(y, m - 1, d, hour, minute);
  // Two passes settle the offset, also across a DST change.
  let t = guess;
  for (let i = 0; i < 2; i++) {
    const p = localParts(t, timeZone);
    const [py, pm, pd] = p.day.split('-').map(Number) as [number, number, number];
    const shown = Date.UTC(py, pm - 1, pd, p.hour, p.minute);
    t += guess - shown;
  }
  return new Date(t);
}

/** Adds whole days to a YYYY-MM-DD day. */
export function addDays(day: string, days: number): string {
  const [y, m, d] = day.split('-').map(Number) as [number, number, number];
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}

/** Whole days from day a to day b (b − a). */
export function daysBetween(a: string, b: string): number {
  return Math.round((Date.parse(`${b}T00:00:00Z`) - Date.parse(`${a}T00:00:00Z`)) / 86_400_000);
}

export const hhmm = (hour: number, minute: number) => `${String(hour).padStart(2, '0')}:${String(minute).padStart(2, '0')}`;
