import { addDays, daysBetween, localDay, zonedTime } from '../../../shared/farm-time';

const DAY = 86_400_000;

/** End of a day-based withdrawal period: the end of treatment (or its start) plus the days. */
export function dayBasedEnd(startsAt: Date, endsAt: Date | null, days: number): Date {
  return new Date((endsAt ?? startsAt).getTime() + days * DAY);
}

/**
 * Degree-day withdrawal (husbandry.md §6): the sum of daily mean water temperatures from the end of the
 * treatment must reach the period. Days already logged count with their measured mean; once the logged
 * days fall short, the rest is projected at the mean of the last 7 logged days (or not at all without data).
 * The first (partial) day counts in full — the conservative reading would be to skip it; we count whole
 * local days from the day after treatment ends, which is the stricter choice.
 */
export function degreeDayEnd(args: {
  treatmentEnd: Date;
  degreeDays: number;
  dailyMeans: Array<{ day: string; meanC: number }>;
  timeZone: string;
  now: Date;
}): { endsAt: Date | null; estimate: 'reached' | 'projected'; degreeDaysSoFar: number } {
  const firstDay = addDays(localDay(args.treatmentEnd, args.timeZone), 1);
  const today = localDay(args.now, args.timeZone);
  let sum = 0;
  const logged = args.dailyMeans.filter((d) => d.day >= firstDay && d.day < today).sort((a, b) => a.day.localeCompare(b.day));
  for (const d of logged) {
    // Below 0 °C a day adds nothing (ice-cold water does not clear a medicine faster by going negative).
    sum += Math.max(0, d.meanC);
    if (sum >= args.degreeDays) {
      return { endsAt: zonedTime(addDays(d.day, 1), 0, 0, args.timeZone), estimate: 'reached', degreeDaysSoFar: sum };
    }
  }
  const recent = logged.slice(-7);
  const meanRecent = recent.length ? recent.reduce((a, d) => a + Math.max(0, d.meanC), 0) / recent.length : 0;
  if (meanRecent <= 0) return { endsAt: null, estimate: 'projected', degreeDaysSoFar: sum };
  const startDay = logged.length ? addDays(logged[logged.length - 1]!.day, 1) : firstDay;
  const daysMore = Math.ceil((args.degreeDays - sum) / meanRecent);
  const endDay = addDays(startDay, daysMore);
  return { endsAt: zonedTime(endDay, 0, 0, args.timeZone), estimate: 'projected', degreeDaysSoFar: sum };
}

export { daysBetween };
