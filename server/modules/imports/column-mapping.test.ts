import { describe, expect, it } from 'vitest';
import { looksLikeDataRow, readBasis, readDate, readNumber, readSampledAt, readTime, suggestMapping, uniqueHeaders } from './column-mapping';
import { sniffDelimiter } from './csv-file';
import { csvCell } from '../exports/csv-writer';

describe('reading the cells people type', () => {
  it('reads kit bases as written on kit labels, with "N" depending on the analyte', () => {
    expect(readBasis('mg/L NH3-N', 'total_ammonia')).toBe('tan-n');
    expect(readBasis('as N', 'total_ammonia')).toBe('tan-n');
    expect(readBasis('as N', 'nitrite')).toBe('no2-n');
    expect(readBasis('NH4+', 'total_ammonia')).toBe('total-nh4');
    expect(readBasis('NH3', 'total_ammonia')).toBe('total-nh3');
    expect(readBasis('mg/L', 'dissolved_oxygen')).toBe('mg-l');
    expect(readBasis('mg/L CaCO3', 'alkalinity')).toBe('caco3');
    expect(readBasis('‰', 'salinity')).toBe('ppt');
    expect(readBasis('furlongs', 'total_ammonia')).toBeNull();
  });

  it('reads 12- and 24-hour times and refuses impossible ones', () => {
    expect(readTime('7:30 am')).toEqual({ h: 7, min: 30, s: 0, ms: 0 });
    expect(readTime('12:05 AM')).toMatchObject({ h: 0, min: 5 });
    expect(readTime('2:15 p.m.')).toMatchObject({ h: 14, min: 15 });
    expect(readTime('23:59:58.5')).toEqual({ h: 23, min: 59, s: 58, ms: 500 });
    expect(readTime('24:00')).toBeNull();
    expect(readTime('13:00 pm')).toBeNull();
  });

  it('reads dates by the mapping order and refuses days that do not exist', () => {
    expect(readDate('2026-06-10', 'dmy')).toEqual({ y: 2026, m: 6, d: 10 });
    expect(readDate('03/04/2026', 'dmy')).toEqual({ y: 2026, m: 4, d: 3 });
    expect(readDate('03/04/2026', 'mdy')).toEqual({ y: 2026, m: 3, d: 4 });
    expect(readDate('03/04/26', 'mdy')).toEqual({ y: 2026, m: 3, d: 4 });
    expect(readDate('03/04/2026', 'ymd')).toBe('ambiguous');
    expect(readDate('2027-02-29', 'ymd')).toBeNull();
  });

  it('turns local times into instants in the given zone, across a DST change (computed)', () => {
    // 2026-03-08 is the spring-forward day in America/Chicago: 01:30 is CST (−6), 03:30 is CDT (−5).
    expect(readSampledAt({ at: '2026-03-08 01:30' }, 'ymd', 'America/Chicago')).toEqual({ iso: '2026-03-08T07:30:00.000Z' });
    expect(readSampledAt({ at: '2026-03-08 03:30' }, 'ymd', 'America/Chicago')).toEqual({ iso: '2026-03-08T08:30:00.000Z' });
    // 02:30 never shows on the clock that night: refused rather than guessed.
    expect(readSampledAt({ at: '2026-03-08 02:30' }, 'ymd', 'America/Chicago')).toEqual({ problem: '2026-03-08 02:30 does not exist in America/Chicago (the clocks moved forward that night)' });
    // 01:30 shows twice on 2026-11-01: the first (CDT, UTC−5) is taken.
    expect(readSampledAt({ at: '2026-11-01 01:30' }, 'ymd', 'America/Chicago')).toEqual({ iso: '2026-11-01T06:30:00.000Z' });
    expect(readSampledAt({ at: '2026-06-10T07:30:00+0200' }, 'ymd', 'America/Chicago')).toEqual({ iso: '2026-06-10T05:30:00.000Z' });
    expect(readSampledAt({ date: '10/06/2026', time: '6:00 pm' }, 'dmy', 'Europe/Madrid')).toEqual({ iso: '2026-06-10T16:00:00.000Z' });
    expect(readSampledAt({ at: '2026-06-10' }, 'ymd', 'UTC')).toEqual({ problem: '"2026-06-10" has a date but no time of day' });
  });

  it('reads decimal commas only when the file is not comma-delimited', () => {
    expect(readNumber(' 0,35 ', true)).toBe(0.35);
    expect(readNumber('0,35', false)).toBeNull();
    expect(readNumber('-1.5e-1', false)).toBe(-0.15);
    expect(readNumber('1.2.3', true)).toBeNull();
  });
});

describe('headers', () => {
  it('renames blank and repeated column names and says so', () => {
    const { headers, warnings } = uniqueHeaders(['Value', '', 'value', 'Value (2)']);
    expect(headers).toEqual(['Value', 'Column 2', 'value (2)', 'Value (2) (2)']);
    expect(warnings.map((w) => w.code)).toEqual(['blank_header', 'duplicate_header']);
  });

  it('tells a data row from a header row', () => {
    expect(looksLikeDataRow(['P1', '2026-06-10 07:30', 'total_ammonia', '0.8'])).toBe(true);
    expect(looksLikeDataRow(['P1', 'tan', '0.8', '7.9'])).toBe(true);
    expect(looksLikeDataRow(['Unit', 'Date', 'TAN (mg/L)', 'pH'])).toBe(false);
  });

  it('suggests a lab sheet mapping and leaves the basis of a bare NH3 column to the user', () => {
    const { mapping, warnings } = suggestMapping(['Sample Date', 'Sample Time', 'Pond', 'NH3 (mg/L)', 'Water Temp °C'], [['06/10/2026', '08:00', 'P1', '0.4', '24']], 'America/Chicago');
    expect(mapping).toMatchObject({
      unitCode: 'Pond',
      sampledAt: { dateColumn: 'Sample Date', timeColumn: 'Sample Time' },
      analyte: { fixed: 'total_ammonia' },
      value: 'NH3 (mg/L)',
      basis: null,
      handheldTemperature: { column: 'Water Temp °C', unit: 'c' },
      dateOrder: 'mdy',
    });
    expect(warnings.map((w) => w.code).sort()).toEqual(['basis_unknown', 'date_order_ambiguous']);
  });

  it('picks the delimiter that splits the first lines consistently', () => {
    expect(sniffDelimiter('a;b;c\n1,5;2;3\n')).toBe(';');
    expect(sniffDelimiter('a\tb\n1\t2\n')).toBe('\t');
    expect(sniffDelimiter('"x,y";b\n1;2\n')).toBe(';');
  });
});

describe('CSV cells of downloads', () => {
  it('prefixes text that a spreadsheet would run as a formula and keeps numbers numeric (OWASP CSV injection)', () => {
    expect(csvCell('=HYPERLINK("http://example.invalid")')).toBe(`'=HYPERLINK("http://example.invalid")`);
    expect(csvCell('+1 fish')).toBe("'+1 fish");
    expect(csvCell('-5 dead')).toBe("'-5 dead");
    expect(csvCell('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(csvCell('\tx')).toBe("'\tx");
    expect(csvCell(-0.4)).toBe('-0.4');
    expect(csvCell(false)).toBe('false');
    expect(csvCell(null)).toBe('');
  });
});
