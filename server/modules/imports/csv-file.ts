import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { open } from 'node:fs/promises';
import { pipeline, Transform, type TransformCallback } from 'node:stream';
import { parse } from 'csv-parse';
import { AppError, badRequest } from '../../http/errors';

// Reading an uploaded CSV without trusting it: what kind of file it really is, whether its bytes are
// UTF-8, which delimiter it uses, and its rows one at a time (memory stays bounded for any size).

export type Delimiter = ',' | ';' | '\t' | '|';
export type CsvRow = { line: number; cells: string[] };

const HEAD_BYTES = 64 * 1024;
/** A row longer than this is almost always a quote that is never closed. */
const MAX_RECORD_BYTES = 128 * 1024;

const notCsv = (code: string, message: string, details?: Record<string, unknown>) => new AppError(415, code, message, details);

/** Looks at the first bytes: refuses workbooks, PDFs, UTF-16 and binary files, and picks the delimiter. */
export async function sniffFile(path: string): Promise<{ delimiter: Delimiter; sizeBytes: number }> {
  const handle = await open(path, 'r');
  try {
    const { size } = await handle.stat();
    if (size === 0) throw badRequest('The file is empty.', undefined, 'empty_file');
    const head = Buffer.alloc(Math.min(size, HEAD_BYTES));
    await handle.read(head, 0, head.length, 0);
    const startsWith = (...bytes: number[]) => bytes.every((b, i) => head[i] === b);
    if (startsWith(0x50, 0x4b, 0x03, 0x04)) {
      throw notCsv('spreadsheet_not_csv', 'This is an Excel workbook (.xlsx), not a CSV file. In the spreadsheet use Save As › "CSV UTF-8" and upload that file.');
    }
    if (startsWith(0xd0, 0xcf, 0x11, 0xe0)) {
      throw notCsv('spreadsheet_not_csv', 'This is an old Excel workbook (.xls), not a CSV file. In the spreadsheet use Save As › "CSV UTF-8" and upload that file.');
    }
    if (startsWith(0x25, 0x50, 0x44, 0x46)) throw notCsv('not_text', 'This is a PDF, not a CSV file.');
    if (startsWith(0xff, 0xfe) || startsWith(0xfe, 0xff)) {
      throw notCsv('not_utf8', 'The file is UTF-16 text. Save it as "CSV UTF-8" and upload it again.', { encoding: 'utf-16' });
    }
    const nul = head.indexOf(0);
    if (nul >= 0) throw notCsv('not_text', `The file is not text: it contains a NUL byte at byte ${nul}. Upload a CSV file.`, { byteOffset: nul });
    return { delimiter: sniffDelimiter(head.toString('utf8')), sizeBytes: size };
  } finally {
    await handle.close();
  }
}

/** The delimiter that splits the first lines (outside quotes) into the same, largest number of cells. */
export function sniffDelimiter(text: string): Delimiter {
  const lines: string[] = [];
  let current = '';
  let quoted = false;
  for (const ch of text.replace(/^\uFEFF/, '')) {
    if (ch === '"') quoted = !quoted;
    if (!quoted && (ch === '\n' || ch === '\r')) {
      if (current.trim()) lines.push(current);
      current = '';
      if (lines.length >= 5) break;
      continue;
    }
    current += ch;
  }
  if (current.trim() && lines.length < 5) lines.push(current);
  const candidates: Delimiter[] = [',', ';', '\t', '|'];
  let best: Delimiter = ',';
  let bestScore = 0;
  for (const d of candidates) {
    const counts = lines.map((l) => countOutsideQuotes(l, d));
    const first = counts[0] ?? 0;
    if (!first) continue;
    const consistent = counts.filter((c) => c === first).length;
    const score = first * consistent;
    if (score > bestScore) {
      best = d;
      bestScore = score;
    }
  }
  return best;
}

function countOutsideQuotes(line: string, d: string): number {
  let n = 0;
  let quoted = false;
  for (const ch of line) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && ch === d) n++;
  }
  return n;
}

/**
 * Checks that the bytes are UTF-8 (RFC 3629: no overlong forms, no surrogates, nothing above U+10FFFF)
 * and passes them on decoded; the first bad byte fails the stream with its line and offset.
 */
class Utf8Check extends Transform {
  private need = 0;
  private lo = 0x80;
  private hi = 0xbf;
  private offset = 0;
  private line = 1;
  private seqStart = 0;
  private lead = 0;
  private readonly decoder = new TextDecoder('utf-8', { fatal: true });
  readonly hash = createHash('sha256');

  constructor() {
    super({ decodeStrings: true, readableObjectMode: false, encoding: 'utf8' });
  }

  override _transform(chunk: Buffer, _enc: BufferEncoding, done: TransformCallback): void {
    this.hash.update(chunk);
    for (let i = 0; i < chunk.length; i++, this.offset++) {
      const b = chunk[i]!;
      if (this.need === 0) {
        if (b < 0x80) {
          if (b === 0x0a) this.line++;
          continue;
        }
        this.seqStart = this.offset;
        this.lead = b;
        if (b >= 0xc2 && b <= 0xdf) this.expect(1, 0x80, 0xbf);
        else if (b === 0xe0) this.expect(2, 0xa0, 0xbf);
        else if ((b >= 0xe1 && b <= 0xec) || b === 0xee || b === 0xef) this.expect(2, 0x80, 0xbf);
        else if (b === 0xed) this.expect(2, 0x80, 0x9f);
        else if (b === 0xf0) this.expect(3, 0x90, 0xbf);
        else if (b >= 0xf1 && b <= 0xf3) this.expect(3, 0x80, 0xbf);
        else if (b === 0xf4) this.expect(3, 0x80, 0x8f);
        else return done(this.problem());
      } else {
        if (b < this.lo || b > this.hi) return done(this.problem());
        this.lo = 0x80;
        this.hi = 0xbf;
        this.need--;
      }
    }
    done(null, this.decoder.decode(chunk, { stream: true }));
  }

  override _flush(done: TransformCallback): void {
    if (this.need > 0) return done(this.problem());
    done(null, this.decoder.decode());
  }

  private expect(need: number, lo: number, hi: number): void {
    this.need = need;
    this.lo = lo;
    this.hi = hi;
  }

  private problem(): AppError {
    const byte = `0x${this.lead.toString(16).toUpperCase().padStart(2, '0')}`;
    return notCsv(
      'not_utf8',
      `The file is not UTF-8 text: the byte ${byte} at line ${this.line} (byte ${this.seqStart}) is not valid UTF-8. ` +
        'It was probably saved as Latin-1 / Windows-1252 (plain "CSV" on many spreadsheets). Save it as "CSV UTF-8" and upload it again.',
      { line: this.line, byteOffset: this.seqStart, byte, encoding: 'not utf-8' },
    );
  }
}

/** Line breaks in a raw record: CRLF counts once, a lone CR or LF once each. */
function lineBreaks(raw: string): number {
  let n = 0;
  for (let i = 0; i < raw.length; i++) {
    const c = raw.charCodeAt(i);
    if (c === 0x0d) {
      n++;
      if (raw.charCodeAt(i + 1) === 0x0a) i++;
    } else if (c === 0x0a) n++;
  }
  return n;
}

const parseProblems: Record<string, string> = {
  CSV_QUOTE_NOT_CLOSED: 'a quoted cell is never closed (a " without its closing ")',
  CSV_MAX_RECORD_SIZE: `a row is longer than ${MAX_RECORD_BYTES / 1024} KB — usually a quote that is never closed`,
  CSV_INVALID_CLOSING_QUOTE: 'a closing quote is followed by other characters',
  CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE: 'a closing quote is followed by other characters',
};

export type RowStream = {
  rows: AsyncGenerator<CsvRow>;
  /** SHA-256 of the file's bytes, complete once `rows` has been read to the end. */
  sha256(): string;
};

/**
 * The file's records in order with the line each starts on (a quoted cell may span lines); fully blank
 * records (an empty line, or only delimiters) are skipped. Parse and encoding problems throw AppErrors.
 */
export function readRows(path: string, delimiter: Delimiter): RowStream {
  const check = new Utf8Check();
  const parser = parse({
    delimiter,
    bom: true,
    raw: true,
    relax_column_count: true,
    relax_quotes: true,
    record_delimiter: ['\r\n', '\n', '\r'],
    skip_empty_lines: false,
    max_record_size: MAX_RECORD_BYTES,
  });
  const last = pipeline(createReadStream(path, { highWaterMark: 64 * 1024 }), check, parser, () => {
    // errors surface through the iterator below
  });
  let digest: string | null = null;
  async function* rows(): AsyncGenerator<CsvRow> {
    let nextLine = 1;
    try {
      for await (const item of last as AsyncIterable<{ record: string[]; raw: string }>) {
        const line = nextLine;
        nextLine += Math.max(1, lineBreaks(item.raw));
        if (item.record.every((c) => c.trim() === '')) continue;
        yield { line, cells: item.record };
      }
      digest = check.hash.digest('hex');
    } catch (err) {
      if (err instanceof AppError) throw err;
      const code = (err as { code?: string }).code ?? '';
      const what = parseProblems[code];
      if (what) {
        throw badRequest(`The CSV cannot be read from line ${nextLine}: ${what}.`, { line: nextLine, problem: code }, 'csv_malformed');
      }
      throw err;
    }
  }
  return {
    rows: rows(),
    sha256: () => {
      if (!digest) throw new Error('the file has not been read to the end');
      return digest;
    },
  };
}
