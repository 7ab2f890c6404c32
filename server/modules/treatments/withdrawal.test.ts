import { describe, expect, it } from 'vitest';
import { addDays, localDay } from '../../../shared/farm-time';
import { dayBasedEnd, degreeDayEnd } from './withdrawal';

describe('withdrawal periods', () => {
  it('ends a day-based period that many days after the treatment ends', () => {
    const end = dayBasedEnd(new Date('2026-05-01T08:00:00Z'), new Date('2026-05-01T14:00:00Z'), 21);
    expect(end.toISOString()).toBe('2026-05-22T14:00:00.000Z');
  });

  it('needs 50 days at a constant 10 °C for 500 degree-days (husbandry.md §6, computed)', () => {
    const tz = 'UTC';
    const treatmentEnd = new Date('2026-01-01T12:00:00Z');
    const first = addDays(localDay(treatmentEnd, tz), 1);
    const dailyMeans = Array.from({ length: 60 }, (_, i) => ({ day: addDays(first, i), meanC: 10 }));
    const r = degreeDayEnd({ treatmentEnd, degreeDays: 500, dailyMeans, timeZone: tz, now: new Date('2026-04-01T00:00:00Z') });
    expect(r.estimate).toBe('reached');
    // 50 whole days from 2 January: the period is complete at the start of 21 February.
    expect(r.endsAt?.toISOString()).toBe('2026-02-21T00:00:00.000Z');
    expect(r.degreeDaysSoFar).toBe(500);
  });

  it('projects the end from the recent mean while the logged days fall short', () => {
    const tz = 'UTC';
    const treatmentEnd = new Date('2026-03-01T10:00:00Z');
    const dailyMeans = Array.from({ length: 10 }, (_, i) => ({ day: addDays('2026-03-02', i), meanC: 20 }));
    const r = degreeDayEnd({ treatmentEnd, degreeDays: 500, dailyMeans, timeZone: tz, now: new Date('2026-03-12T09:00:00Z') });
    expect(r.estimate).toBe('projected');
    expect(r.degreeDaysSoFar).toBe(200);
    // 300 more at 20 °C/day = 15 more days after 11 March.
    expect(r.endsAt?.toISOString()).toBe('2026-03-27T00:00:00.000Z');
  });
});
