import { describe, expect, it } from 'vitest';
import { addDays, formatDay, isDay } from './day';

describe('report days', () => {
  it('steps across month and year ends', () => {
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01');
    expect(addDays('2026-03-01', -1)).toBe('2026-02-28');
  });
  it('writes the day out in the reader’s language', () => {
    expect(formatDay('2026-12-01', 'en')).toBe('Tuesday, December 1');
    expect(formatDay('2026-12-01', 'es')).toBe('martes, 1 de diciembre');
  });
  it('accepts only YYYY-MM-DD', () => {
    expect(isDay('2026-12-01')).toBe(true);
    expect(isDay('1/12/2026')).toBe(false);
  });
});
