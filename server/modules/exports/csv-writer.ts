import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { Response } from 'express';
import { stringify } from 'csv-stringify';

// Streaming CSV downloads (exports and records). Cells are typed: numbers are written as numbers, so a
// negative value stays "-0.4"; text is guarded against formula injection (OWASP "CSV Injection"): a
// text cell starting with = + - @, a tab or a carriage return gets a leading single quote, so a
// spreadsheet shows it as text instead of running it.

export type Cell = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;

/** A cell as written: numbers as-is, booleans as true/false, text escaped against formulas. */
export function csvCell(v: Cell): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  return FORMULA_START.test(v) ? `'${v}` : v;
}

export type CsvDownload = {
  fileName: string;
  header: string[];
  rows: AsyncIterable<Cell[]>;
  /** Called once the download ends, however it ends. */
  done?: () => void;
};

/** A file name safe in a Content-Disposition header and on any file system. */
export function safeFileName(parts: string[], ext = 'csv'): string {
  const base = parts
    .map((p) =>
      p
        .normalize('NFKD')
        .replace(/[\u0300-\u036f]/g, '')
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, '-')
        .replace(/^-+|-+$/g, ''),
    )
    .filter(Boolean)
    .join('_')
    .slice(0, 150);
  return `${base || 'export'}.${ext}`;
}

async function* records(header: string[], first: IteratorResult<Cell[]>, rest: AsyncIterator<Cell[]>): AsyncGenerator<string[]> {
  try {
    yield header.map(csvCell);
    let next = first;
    while (!next.done) {
      yield next.value.map(csvCell);
      next = await rest.next();
    }
  } finally {
    // Stops the query when the client goes away mid-download.
    await rest.return?.();
  }
}

/**
 * Streams a download to the response with backpressure. A client that goes away stops the query; an
 * error after the first bytes cuts the response off (a truncated file is never passed off as complete).
 */
export async function sendCsv(res: Response, d: CsvDownload, onError: (err: unknown) => void): Promise<void> {
  const rows = d.rows[Symbol.asyncIterator]();
  let first: IteratorResult<Cell[]>;
  try {
    // The first rows are read before any byte is sent, so a failing query still answers in the error shape.
    first = await rows.next();
  } catch (err) {
    d.done?.();
    throw err;
  }
  res.status(200);
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${d.fileName}"`);
  res.setHeader('Cache-Control', 'no-store');
  res.setHeader('X-Content-Type-Options', 'nosniff');
  try {
    // A UTF-8 byte-order mark so spreadsheets on Windows read accented names correctly.
    await pipeline(Readable.from(records(d.header, first, rows)), stringify({ bom: true, eof: true, record_delimiter: '\r\n' }), res);
  } catch (err) {
    const code = (err as { code?: string }).code;
    if (code !== 'ERR_STREAM_PREMATURE_CLOSE') onError(err);
    if (!res.writableEnded) res.destroy();
  } finally {
    d.done?.();
  }
}
