import { describe, expect, it } from 'vitest';
import { addDays, daysBetween, localDay, localParts, zonedTime } from './farm-time';

describe('farm-local time', () => {
  it('gives the local day of an instant, which differs from the UTC day in the evening in Chicago', () => {
    // 2026-07-01 03:30 UTC is 22:30 on 30 June in Chicago (CDT, UTC−5) — time zone rules, published by IANA.
    expect(localDay(Date.parse('2026-07-01T03:30:00Z'), 'America/Chicago')).toBe('2026-06-30');
    expect(localParts(Date.parse('2026-07-01T03:30:00Z'), 'America/Chicago').hour).toBe(22);
  });

  it('turns a local wall-clock time into the right instant in summer and in winter', () => {
    expect(zonedTime('2026-07-01', 15, 0, 'America/Chicago').toISOString()).toBe('2026-07-01T20:00:00.000Z');
    expect(zonedTime('2026-12-01', 15, 0, 'America/Chicago').toISOString()).toBe('2026-12-01T21:00:00.000Z');
  });

  it('adds and counts days across month ends', () => {
    expect(addDays('2026-02-27', 3)).toBe('2026-03-02');
    expect(daysBetween('2026-12-30', '2027-01-02')).toBe(3);
  });
});
