import { addDays, daysBetween, localDay } from '../../../shared/farm-time';
import type { CultureUnit } from '../../db/entities';

export type ScheduleEntry = { everyDays: number; dueDay: string; status: 'overdue' | 'due' | 'upcoming'; daysOverdue: number; reason: string };

/**
 * Routine ammonia testing (common practice, no source): a cycling unit daily until its biofilter is
 * established, an established unit weekly (or its own frequency), a unit on closer watch daily, a
 * fallow unit never. Days are the farm's local days.
 */
export function testSchedule(unit: Pick<CultureUnit, 'state' | 'testFrequencyDays' | 'closeWatchUntil'>, lastTestAt: Date | null, now: Date, timeZone: string): ScheduleEntry | null {
  if (unit.state === 'fallow') return null;
  const closeWatch = unit.closeWatchUntil !== null && unit.closeWatchUntil > now;
  const everyDays = closeWatch || unit.state === 'cycling' ? 1 : (unit.testFrequencyDays ?? 7);
  const today = localDay(now, timeZone);
  const dueDay = lastTestAt ? addDays(localDay(lastTestAt, timeZone), everyDays) : today;
  const daysOverdue = Math.max(0, daysBetween(dueDay, today));
  const status = dueDay < today ? 'overdue' : dueDay === today ? 'due' : 'upcoming';
  const reason = closeWatch
    ? 'daily while on closer watch after a die-off sign'
    : unit.state === 'cycling'
      ? 'daily until the biofilter is established'
      : `every ${everyDays} days`;
  return { everyDays, dueDay, status, daysOverdue, reason };
}
