// CSV import fuzz (server/modules/imports): broken encodings, missing and odd headers, quotes,
// spreadsheet formulas, NUL bytes past the sniffed head, hostile values, 100,000 rows. Each file is
// uploaded as a probe's manager would, validated and committed with skipRejected; every answer is
// below 500 in the error shape, every run ends in a final state (never stuck, never "failed" with
// internals), and formulas that were stored come back neutralised in the tests export.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
let farmId: string;
let agent: Awaited<ReturnType<typeof signedIn>>;

beforeAll(async () => {
  t = await startTestApp();
  const seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  agent = await signedIn(t.app, demoEmail('manager'));
});
afterAll(() => t.close());

const HEADER = 'unit,sampled_at,analyte,method,basis,value,note';
const MAPPING = {
  unitCode: 'unit',
  sampledAt: { column: 'sampled_at' },
  analyte: { column: 'analyte' },
  method: { column: 'method' },
  basis: { column: 'basis' },
  value: 'value',
  note: 'note',
};
const row = (i: number, value = '0.4', note = 'fuzz') => `P${(i % 6) + 1},2026-11-${String((i % 28) + 1).padStart(2, '0')}T08:${String(i % 60).padStart(2, '0')}:00Z,total_ammonia,salicylate,tan-n,${value},${note}`;
const lines = (...rows: string[]) => `${[HEADER, ...rows].join('\n')}\n`;

const FORMULAS = ['=1+1', '+1+1', '-2+3', '@SUM(A1:A2)', '=HYPERLINK("http://evil.example","click")', "=cmd|' /C calc'!A0", '\t=1+1', '\r=1+1'];

type CsvCase = { name: string; bytes: Buffer; fileName?: string };
const utf8 = (name: string, text: string, fileName?: string): CsvCase => ({ name, bytes: Buffer.from(text, 'utf8'), ...(fileName ? { fileName } : {}) });

function cases(): CsvCase[] {
  const good = lines(row(1), row(2));
  return [
    utf8('empty file', ''),
    utf8('only a header', `${HEADER}\n`),
    utf8('header without a newline', HEADER),
    utf8('no header that matches the mapping', 'a,b,c\n1,2,3\n'),
    utf8('duplicate and blank headers', 'unit,unit,,sampled_at,,analyte\nP1,P2,x,2026-11-01T08:00:00Z,y,total_ammonia\n'),
    utf8('only blank lines', '\n\n\r\n,,,\n'),
    utf8('UTF-8 BOM', `\uFEFF${good}`),
    { name: 'UTF-16 LE with BOM', bytes: Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(good, 'utf16le')]) },
    { name: 'UTF-16 LE without BOM', bytes: Buffer.from(good, 'utf16le') },
    { name: 'Latin-1 é', bytes: Buffer.from(lines(row(1, '0.4', 'caf\u00e9')), 'latin1') },
    { name: 'overlong UTF-8', bytes: Buffer.concat([Buffer.from(lines(row(1))), Buffer.from([0xc0, 0xaf, 0x0a])]) },
    { name: 'UTF-8 surrogate', bytes: Buffer.concat([Buffer.from(lines(row(1))), Buffer.from([0xed, 0xa0, 0x80, 0x0a])]) },
    { name: 'above U+10FFFF', bytes: Buffer.concat([Buffer.from(lines(row(1))), Buffer.from([0xf4, 0x90, 0x80, 0x80, 0x0a])]) },
    { name: 'truncated multibyte at the end', bytes: Buffer.concat([Buffer.from(lines(row(1))), Buffer.from([0xe2, 0x82])]) },
    { name: 'NUL byte in the first line', bytes: Buffer.from(`unit\u0000,x\n1,2\n`) },
    { name: 'zip signature named .csv', bytes: Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), Buffer.from(good)]) },
    { name: 'PDF signature', bytes: Buffer.from(`%PDF-1.7\n${good}`) },
    utf8('workbook extension', good, 'results.xlsx'),
    utf8('unclosed quote', lines(row(1), 'P1,"2026-11-01T08:00:00Z,total_ammonia,salicylate,tan-n,0.4,never closed')),
    utf8('quote followed by text', lines('P1,"2026-11-01T08:00:00Z"x,total_ammonia,salicylate,tan-n,0.4,q')),
    utf8('quotes, escaped quotes and line breaks inside cells', lines(row(1, '0.4', '"said ""hi"""'), row(2, '0.5', '"two\nlines\r\nthree"'), row(3, '"0.6"', '"a,b;c|d"'))),
    utf8('a row over 128 KB', lines(row(1, '0.4', 'x'.repeat(140_000)))),
    utf8('250 columns', `${Array.from({ length: 250 }, (_, i) => `c${i}`).join(',')}\n${Array.from({ length: 250 }, () => '1').join(',')}\n`),
    utf8('semicolons and decimal commas', lines(...[row(1), row(2)].map((r) => r.replaceAll(',', ';').replace('0.4', '0,4'))).replace(HEADER, HEADER.replaceAll(',', ';'))),
    utf8('tabs', lines(row(1), row(2)).replaceAll(',', '\t')),
    utf8('pipes', lines(row(1), row(2)).replaceAll(',', '|')),
    utf8('CR-only line ends', lines(row(1), row(2)).replaceAll('\n', '\r')),
    utf8('mixed line ends', `${HEADER}\r\n${row(1)}\n${row(2)}\r${row(3)}\r\n`),
    utf8(
      'hostile values',
      lines(
        row(1, 'NaN'),
        row(2, 'Infinity'),
        row(3, '1e309'),
        row(4, '-0'),
        row(5, '-1'),
        row(6, ''),
        row(7, '0x10'),
        row(8, '1,5'),
        'P1,2026-02-30T08:00:00Z,total_ammonia,salicylate,tan-n,0.4,feb 30',
        'P1,31/02/2024,total_ammonia,salicylate,tan-n,0.4,slashes',
        'P1,2999-01-01T00:00:00Z,total_ammonia,salicylate,tan-n,0.4,far future',
        'P1,0001-01-01T00:00:00Z,total_ammonia,salicylate,tan-n,0.4,long ago',
        'NOPE,2026-11-01T08:00:00Z,total_ammonia,salicylate,tan-n,0.4,unknown unit',
        "P1'; DROP TABLE water_tests;--,2026-11-01T08:00:00Z,total_ammonia,salicylate,tan-n,0.4,sql",
        'P1,2026-11-01T08:00:00Z,__proto__,salicylate,tan-n,0.4,proto',
        'P1,2026-11-01T08:00:00Z,total_ammonia,constructor,tan-n,0.4,proto',
        'P1,2026-11-01T08:00:00Z,total_ammonia,salicylate,tan-n,0.4,💧\u202E\uFFFD',
        'P1',
        'P1,2026-11-01T08:00:00Z,total_ammonia,salicylate,tan-n,0.4,note,extra,cells,here',
      ),
    ),
    utf8('spreadsheet formulas in every column', lines(...FORMULAS.map((f, i) => row(i + 10, '0.4', `"${f.replaceAll('"', '""')}"`)), ...FORMULAS.map((f) => `"${f.replaceAll('"', '""')}",2026-11-01T08:00:00Z,${f.startsWith('=') ? f : 'total_ammonia'},salicylate,tan-n,0.4,x`))),
  ];
}

/** 1,500 good rows (past the 64 KB the upload sniffs), then one whose note holds a NUL byte. */
const nulAfterHead = (): CsvCase => ({
  name: 'NUL byte after the sniffed head',
  bytes: Buffer.concat([Buffer.from(lines(...Array.from({ length: 1500 }, (_, i) => row(i)))), Buffer.from(`${row(2000, '0.4', 'a\u0000b')}\n`)]),
});

function errorShapeProblem(res: request.Response): string | null {
  if (res.status >= 500) return `status ${res.status}`;
  if (/\n\s+at |\.(?:ts|js):\d+|node_modules|QueryFailedError|invalid byte sequence/.test(res.text ?? '')) return `internals: ${res.text.slice(0, 200)}`;
  if (res.status >= 400) {
    const e = (res.body as { error?: { code?: unknown; message?: unknown } }).error;
    if (!e || typeof e.code !== 'string' || typeof e.message !== 'string' || Object.keys(res.body as object).length !== 1) return `not the error shape: ${res.text.slice(0, 200)}`;
  }
  return null;
}

type Status = { state: string; processedRows: number; acceptedRows: number; rejectedRows: number; error?: { code: string; message: string } | null; commit?: { storedRows: number } | null };

async function settle(importId: string, timeoutMs = 120_000): Promise<Status> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await agent.get(`/api/farms/${farmId}/imports/${importId}`);
    if (res.status !== 200) throw new Error(`GET import: ${res.status} ${res.text.slice(0, 200)}`);
    const s = res.body as Status;
    if (s.state !== 'validating' && s.state !== 'committing') return s;
    if (Date.now() > deadline) throw new Error(`import ${importId} still ${s.state} after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** Upload, validate, commit (skipping rejected rows); the problems seen on the way. */
async function runImport(c: CsvCase): Promise<{ problems: string[]; upload: number; final: Status | null; importId: string | null }> {
  const problems: string[] = [];
  const up = await agent.post(`/api/farms/${farmId}/imports`).set('x-gillwise-client', 'web').attach('file', c.bytes, { filename: c.fileName ?? 'fuzz.csv', contentType: 'text/csv' });
  const p = errorShapeProblem(up);
  if (p) problems.push(`upload: ${p}`);
  if (up.status >= 300) return { problems, upload: up.status, final: null, importId: null };
  const importId = (up.body as { importId: string }).importId;
  const validate = await agent.post(`/api/farms/${farmId}/imports/${importId}/validate`).send({ mapping: MAPPING });
  const pv = errorShapeProblem(validate);
  if (pv) problems.push(`validate: ${pv}`);
  if (validate.status >= 300 && validate.status !== 202) return { problems, upload: up.status, final: null, importId };
  const validated = await settle(importId);
  const commit = await agent.post(`/api/farms/${farmId}/imports/${importId}/commit`).send({ mapping: MAPPING, skipRejected: true });
  const pc = errorShapeProblem(commit);
  if (pc) problems.push(`commit: ${pc}`);
  const final = commit.status === 202 ? await settle(importId) : validated;
  if (final.state === 'failed' && /QueryFailedError|invalid byte sequence|\.ts:\d+/.test(JSON.stringify(final.error))) problems.push(`failed with internals: ${JSON.stringify(final.error)}`);
  if (final.state === 'failed' && final.error?.code === 'internal') problems.push(`failed: ${JSON.stringify(final.error)}`);
  return { problems, upload: up.status, final, importId };
}

describe('CSV import fuzz', () => {
  it('reads broken, hostile and odd CSV files without a 5xx, a stuck run or a stored formula that would run', async () => {
    const started = Date.now();
    const problems: string[] = [];
    const outcomes: string[] = [];
    for (const c of cases()) {
      const r = await runImport(c);
      for (const p of r.problems) problems.push(`${c.name}: ${p}`);
      outcomes.push(`${c.name}=${r.upload}/${r.final ? `${r.final.state}:${r.final.commit?.storedRows ?? 0}+${r.final.rejectedRows}r` : '-'}`);
    }
    // Formulas that were stored come back guarded in the export (a leading ' makes a spreadsheet show text).
    const exported = await agent.get(`/api/farms/${farmId}/exports/tests.csv`).query({ from: '2026-10-01T00:00:00Z', to: '2026-12-31T00:00:00Z', once: '1' });
    expect(exported.status).toBe(200);
    const cells = exported.text.split(/\r?\n/).flatMap((l) => l.split(','));
    const live = cells.map((c) => c.replace(/^"|"$/g, '')).filter((c) => /^[=+\-@\t\r]/.test(c) && !/^-?\d/.test(c));
    console.log(`[fuzz] csv: files=${outcomes.length} problems=${problems.length} seconds=${((Date.now() - started) / 1000).toFixed(1)} outcomes=${outcomes.join('; ')}`);
    expect(problems).toEqual([]);
    expect(live).toEqual([]);
    expect(exported.text).toContain("'=1+1");
  });

  it('validates a 100,000-row file in bounded time and reports every row', async () => {
    const started = Date.now();
    const rows = Array.from({ length: 100_000 }, (_, i) => (i % 1000 === 999 ? row(i, 'not-a-number') : row(i)));
    const up = await agent.post(`/api/farms/${farmId}/imports`).set('x-gillwise-client', 'web').attach('file', Buffer.from(lines(...rows)), { filename: 'big.csv', contentType: 'text/csv' });
    expect(up.status).toBe(201);
    expect(up.body.totalRows).toBe(100_000);
    const importId = up.body.importId as string;
    const v = await agent.post(`/api/farms/${farmId}/imports/${importId}/validate`).send({ mapping: MAPPING });
    expect([200, 202]).toContain(v.status);
    const done = await settle(importId, 150_000);
    console.log(`[fuzz] csv 100k rows: state=${done.state} processed=${done.processedRows} accepted=${done.acceptedRows} rejected=${done.rejectedRows} seconds=${((Date.now() - started) / 1000).toFixed(1)}`);
    expect(done).toMatchObject({ state: 'validated', processedRows: 100_000, acceptedRows: 99_900, rejectedRows: 100 });
  });

  // Known gap (server/modules/imports, reported): the NUL check looks at the first 64 KB only, so a NUL
  // further down passes validation and the commit then fails whole in PostgreSQL ("internal", nothing
  // stored, skipRejected or not). Expected to fail until csv-file.ts refuses a NUL byte anywhere (or
  // the row check rejects the row); then drop `.fails`.
  it.fails('refuses a NUL byte after the first 64 KB as it does one in the head, or rejects only that row', async () => {
    const r = await runImport(nulAfterHead());
    console.log(`[fuzz] csv NUL after 64 KB: upload=${r.upload} final=${r.final ? `${r.final.state}:${JSON.stringify(r.final.error ?? null)}` : '-'}`);
    expect(r.problems).toEqual([]);
  });
});
