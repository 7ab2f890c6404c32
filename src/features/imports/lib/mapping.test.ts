import { describe, expect, it } from 'vitest';
import { checkMapping, draftFrom, usesOf } from './mapping';

const suggested = {
  unitCode: 'Unit',
  sampledAt: { dateColumn: 'Date', timeColumn: 'Time' },
  dateOrder: 'ymd' as const,
  timeZone: 'America/Chicago',
  analyte: { column: 'Analyte' },
  method: { column: 'Method' },
  basis: null,
  value: 'Result',
  handheldPh: 'pH',
  handheldTemperature: { column: 'Temp (°F)', unit: 'f' as const },
  handheldSalinityPpt: null,
  note: 'Notes',
};

describe('the import mapping draft', () => {
  it('starts from the server’s suggestion and is refused while the basis is unknown', () => {
    const d = draftFrom(suggested);
    expect(d.sampledMode).toBe('split');
    expect(d.temperatureUnit).toBe('f');
    const check = checkMapping(d);
    expect(check.ok).toBe(false);
    if (!check.ok) expect(check.missing).toEqual(['basis']);
  });

  it('passes the shared schema once the basis is given as one value for every row', () => {
    const d = draftFrom(suggested);
    d.basis = { mode: 'fixed', column: '', fixed: 'tan-n' };
    const check = checkMapping(d);
    expect(check.ok).toBe(true);
    if (check.ok) {
      expect(check.mapping.basis).toEqual({ fixed: 'tan-n' });
      expect(check.mapping.sampledAt).toEqual({ dateColumn: 'Date', timeColumn: 'Time' });
      expect(check.mapping.handheldTemperature).toEqual({ column: 'Temp (°F)', unit: 'f' });
    }
    expect(usesOf(d).get('Date')).toEqual(['date']);
  });
});
