import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importStatusSchema, importUploadResponseSchema, type ImportMappingInput, type ImportStatus } from '../../shared/schemas/imports.schema';
import type { SeedResult } from '../../server/db/seed/seed';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
let dataDir: string;
type Agent = Awaited<ReturnType<typeof signedIn>>;
let planner: Agent;

const fixture = (name: string) => readFileSync(join(import.meta.dirname, '../fixtures/csv', name));

beforeAll(async () => {
  dataDir = mkdtempSync(join(tmpdir(), 'gillwise-imports-'));
  t = await startTestApp({ worker: true, env: { DATA_DIR: dataDir } });
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  planner = await signedIn(t.app, demoEmail('planner'));
}, 120_000);
afterAll(async () => {
  await t.services.imports.idle();
  await t.close();
  rmSync(dataDir, { recursive: true, force: true });
});

function upload(content: Buffer | string, fileName = 'kits.csv', contentType = 'text/csv') {
  return planner
    .post(`/api/farms/${farmId}/imports`)
    .set('x-gillwise-client', 'web')
    .attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content, 'utf8'), { filename: fileName, contentType });
}

const url = (importId: string, tail = '') => `/api/farms/${farmId}/imports/${importId}${tail}`;

async function until(importId: string, done: (s: ImportStatus) => boolean, seen: ImportStatus[] = [], timeoutMs = 60_000): Promise<ImportStatus> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await planner.get(url(importId)).query({ rejectsLimit: 1000 });
    expect(res.status).toBe(200);
    const status = importStatusSchema.parse(res.body);
    seen.push(status);
    if (done(status)) return status;
    if (Date.now() > deadline) throw new Error(`import ${importId} still ${status.state} after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 20));
  }
}
const settled = (s: ImportStatus) => s.state !== 'validating' && s.state !== 'committing';

const count = async (sql: string, params: unknown[]) => ((await t.ds.query(sql, params)) as Array<{ n: number }>)[0]!.n;

const labMapping: ImportMappingInput = {
  unitCode: 'unit_code',
  sampledAt: { column: 'sampled_at' },
  analyte: { column: 'parameter' },
  method: { column: 'method' },
  basis: { column: 'basis' },
  value: 'value',
  note: 'note',
};

describe('importing a CSV of kit results', () => {
  it('suggests the mapping of a kit log, reads its local times in the farm time zone and commits every row, queuing free ammonia', async () => {
    const res = await upload(fixture('kit-log.csv'), 'kit-log.csv');
    expect(res.status).toBe(201);
    importUploadResponseSchema.parse(res.body);
    expect(res.body.headers).toEqual(['Unit', 'Date', 'Time', 'Analyte', 'Method', 'Reported as', 'Result', 'pH', 'Temp (°F)', 'Notes']);
    expect(res.body.totalRows).toBe(4);
    // A quoted note with a line break inside: the next row starts two lines later.
    expect(res.body.preview.map((r: { line: number }) => r.line)).toEqual([2, 3, 4, 6]);
    expect(res.body.suggestedMapping).toEqual({
      unitCode: 'Unit',
      sampledAt: { dateColumn: 'Date', timeColumn: 'Time' },
      dateOrder: 'ymd',
      timeZone: 'America/Chicago',
      analyte: { column: 'Analyte' },
      method: { column: 'Method' },
      basis: { column: 'Reported as' },
      value: 'Result',
      handheldPh: 'pH',
      handheldTemperature: { column: 'Temp (°F)', unit: 'f' },
      handheldSalinityPpt: null,
      note: 'Notes',
    });
    const importId = res.body.importId as string;
    const mapping = res.body.suggestedMapping;

    const validated = await planner.post(url(importId, '/validate')).send({ mapping });
    expect(validated.status).toBe(200);
    importStatusSchema.parse(validated.body);
    expect(validated.body).toMatchObject({ state: 'validated', totalRows: 4, processedRows: 4, acceptedRows: 4, rejectedRows: 0, rejects: [] });

    const started = await planner.post(url(importId, '/commit')).send({ mapping });
    expect(started.status).toBe(202);
    const done = await until(importId, settled);
    expect(done.state).toBe('committed');
    expect(done.commit).toMatchObject({ storedRows: 4, alreadyStoredRows: 0, skippedRows: 0, queuedResults: 3 });

    const rows = (await t.ds.query(
      `SELECT u.code, w.analyte, w.method, w.basis, w.value, w.sampled_at, w.handheld_ph, w.handheld_temperature_c, w.note, w.source
       FROM water_tests w JOIN culture_units u ON u.id = w.unit_id WHERE w.farm_id = $1 AND w.source = 'import' AND w.sampled_at::date = '2026-06-10'
       ORDER BY w.sampled_at`,
      [farmId],
    )) as Array<Record<string, unknown>>;
    expect(rows.map((r) => [r.code, r.analyte, r.method, r.basis, (r.sampled_at as Date).toISOString(), r.handheld_temperature_c])).toEqual([
      // 07:30 CDT is 12:30 UTC; 77 °F is 25 °C (computed)
      ['P1', 'total_ammonia', 'salicylate', 'tan-n', '2026-06-10T12:30:00.000Z', 25],
      ['P2', 'total_ammonia', 'salicylate', 'tan-n', '2026-06-10T12:45:00.000Z', 26],
      ['P3', 'nitrite', 'colorimetric', 'no2-n', '2026-06-10T13:05:00.000Z', null],
      ['R1', 'total_ammonia', 'nessler', 'tan-n', '2026-06-10T19:15:00.000Z', 15],
    ]);
    expect(rows.find((r) => r.code === 'R1')?.note).toBe('after the screen was cleaned\r\nsecond line of the note');

    await t.drain({ queues: ['results'], timeoutMs: 30_000 });
    const results = (await t.ds.query(
      `SELECT r.status, r.ph, r.temperature_c FROM free_ammonia_results r JOIN water_tests w ON w.id = r.water_test_id
       WHERE w.farm_id = $1 AND w.source = 'import' AND w.sampled_at::date = '2026-06-10' ORDER BY w.sampled_at`,
      [farmId],
    )) as Array<{ status: string; ph: number; temperature_c: number }>;
    expect(results.map((r) => r.status)).toEqual(['ok', 'ok', 'ok']);
    expect(results.map((r) => r.temperature_c)).toEqual([25, 26, 15]);
  });

  it('lists every rejected row with its line and reasons, stores nothing while any is rejected, and stores the good rows with skipRejected', async () => {
    const res = await upload(fixture('lab-results-bad-rows.csv'), 'lab-results.csv');
    expect(res.status).toBe(201);
    const importId = res.body.importId as string;

    const validated = await planner.post(url(importId, '/validate')).send({ mapping: labMapping });
    expect(validated.status).toBe(200);
    expect(validated.body).toMatchObject({ state: 'validated', totalRows: 8, acceptedRows: 2, rejectedRows: 6 });
    const rejects = validated.body.rejects as Array<{ line: number; reasons: string[] }>;
    expect(rejects.map((r) => r.line)).toEqual([3, 4, 5, 6, 7, 9]);
    const reasonOf = (line: number) => rejects.find((r) => r.line === line)!.reasons.join(' | ');
    expect(reasonOf(3)).toMatch(/"unit_code": "P9" is not a unit of this farm/);
    expect(reasonOf(4)).toMatch(/"value": "abc" is not a number/);
    expect(reasonOf(5)).toMatch(/"sampled_at": "2026-02-30" is not a date/);
    expect(reasonOf(6)).toMatch(/salicylate is not a method for nitrite/);
    expect(reasonOf(7)).toMatch(/between 0 and 100 mg\/L/);
    expect(reasonOf(9)).toMatch(/in the future/);

    const refused = await planner.post(url(importId, '/commit')).send({ mapping: labMapping });
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatchObject({ code: 'rows_rejected', details: { rejectedRows: 6 } });
    expect(await count(`SELECT count(*)::int AS n FROM water_tests WHERE farm_id = $1 AND sampled_at::date = '2026-06-11'`, [farmId])).toBe(0);

    const started = await planner.post(url(importId, '/commit')).send({ mapping: labMapping, skipRejected: true });
    expect(started.status).toBe(202);
    const done = await until(importId, settled);
    expect(done.state).toBe('committed');
    expect(done.commit).toMatchObject({ skipRejected: true, storedRows: 2, skippedRows: 6, queuedResults: 2 });
    expect(done.rejects.map((r) => r.line)).toEqual([3, 4, 5, 6, 7, 9]);
    const notes = (await t.ds.query(`SELECT note FROM water_tests WHERE farm_id = $1 AND source = 'import' AND sampled_at::date = '2026-06-11' ORDER BY note`, [farmId])) as Array<{
      note: string;
    }>;
    expect(notes.map((n) => n.note)).toEqual(['good row', 'good row, with a comma']);
  });

  it('rolls the whole commit back when rows turn out rejected and the file was not validated first', async () => {
    const csv =
      'unit_code,sampled_at,parameter,method,basis,value,note\n' +
      'P4,2026-06-13T08:00:00Z,total_ammonia,salicylate,tan-n,0.5,rollback good 1\n' +
      'P4,2026-06-13T09:00:00Z,total_ammonia,salicylate,tan-n,-3,rollback bad\n' +
      'P4,2026-06-13T10:00:00Z,total_ammonia,salicylate,tan-n,0.6,rollback good 2\n';
    const res = await upload(csv);
    const importId = res.body.importId as string;
    expect((await planner.post(url(importId, '/commit')).send({ mapping: labMapping })).status).toBe(202);
    const done = await until(importId, settled);
    expect(done.state).toBe('validated');
    expect(done.error?.code).toBe('rows_rejected');
    expect(done.rejects).toEqual([{ line: 3, reasons: [expect.stringMatching(/between 0 and 100/)] }]);
    expect(await count(`SELECT count(*)::int AS n FROM water_tests WHERE note LIKE 'rollback%'`, [])).toBe(0);
  });

  it('stores a re-committed import once, returns the same import for the same file, and adds only the new analyte when a meter log is committed again for another column', async () => {
    const csv =
      'unit,taken,DO (mg/L),Temp (°C),comment\n' +
      'P6,2026-06-14T08:00:00Z,5.1,27.5,twice 1\n' +
      'P6,2026-06-14T09:00:00Z,4.8,27.9,twice 2\n';
    const first = await upload(csv);
    expect(first.status).toBe(201);
    const importId = first.body.importId as string;
    const oxygen: ImportMappingInput = {
      unitCode: 'unit',
      sampledAt: { column: 'taken' },
      analyte: { fixed: 'dissolved_oxygen' },
      method: { fixed: 'meter' },
      basis: { fixed: 'mg-l' },
      value: 'DO (mg/L)',
      handheldTemperature: { column: 'Temp (°C)', unit: 'c' },
      note: 'comment',
    };
    await planner.post(url(importId, '/commit')).send({ mapping: oxygen });
    expect((await until(importId, settled)).commit).toMatchObject({ storedRows: 2, alreadyStoredRows: 0 });

    // The same commit again, even with a mapping that drops the notes: nothing is stored twice.
    await planner.post(url(importId, '/commit')).send({ mapping: { ...oxygen, note: null } });
    const again = await until(importId, (s) => settled(s) && s.commit?.finishedAt !== null);
    expect(again.state).toBe('committed');
    expect(again.commit).toMatchObject({ storedRows: 0, alreadyStoredRows: 2, queuedResults: 0 });

    const reupload = await upload(csv, 'renamed-copy.csv');
    expect(reupload.status).toBe(200);
    expect(reupload.body).toMatchObject({ importId, existing: true, state: 'committed' });

    // The temperature column of the same log is another analyte: its rows are new tests.
    await planner.post(url(importId, '/commit')).send({ mapping: { ...oxygen, analyte: { fixed: 'temperature' }, basis: { fixed: 'c' }, value: 'Temp (°C)', handheldTemperature: null } });
    const temperature = await until(importId, (s) => settled(s) && s.commit?.finishedAt !== null);
    expect(temperature.commit).toMatchObject({ storedRows: 2, alreadyStoredRows: 0 });
    const stored = (await t.ds.query(`SELECT analyte, count(*)::int AS n FROM water_tests WHERE note LIKE 'twice%' GROUP BY analyte ORDER BY analyte`, [])) as Array<{ analyte: string; n: number }>;
    expect(stored).toEqual([
      { analyte: 'dissolved_oxygen', n: 2 },
      { analyte: 'temperature', n: 2 },
    ]);
  });

  it('reports growing progress while it checks and commits a 20 000-row file, and finishes', async () => {
    const lines = ['pond,timestamp,test,kit,as,reading'];
    const start = Date.parse('2026-01-01T00:00:00Z');
    for (let i = 0; i < 20_000; i++) {
      lines.push(`${['P1', 'P2', 'P3', 'P4'][i % 4]},${new Date(start + i * 60_000).toISOString()},nitrite,colorimetric,NO2-N,${(i % 50) / 100}`);
    }
    const res = await upload(lines.join('\n') + '\n', 'meter-dump.csv');
    expect(res.status).toBe(201);
    expect(res.body.totalRows).toBe(20_000);
    const importId = res.body.importId as string;
    const mapping = res.body.suggestedMapping;
    expect(mapping).toMatchObject({ unitCode: 'pond', sampledAt: { column: 'timestamp' }, analyte: { column: 'test' }, method: { column: 'kit' }, basis: { column: 'as' }, value: 'reading' });

    const seen: ImportStatus[] = [];
    const validating = await planner.post(url(importId, '/validate')).send({ mapping });
    expect([200, 202]).toContain(validating.status);
    const validated = await until(importId, settled, seen);
    expect(validated).toMatchObject({ state: 'validated', acceptedRows: 20_000, rejectedRows: 0 });

    seen.length = 0;
    expect((await planner.post(url(importId, '/commit')).send({ mapping })).status).toBe(202);
    const done = await until(importId, settled, seen);
    expect(done.state).toBe('committed');
    expect(done.commit?.storedRows).toBe(20_000);
    const progress = seen.filter((s) => s.state === 'committing').map((s) => s.processedRows);
    expect(progress.some((n) => n > 0 && n < 20_000)).toBe(true);
    expect(progress).toEqual([...progress].sort((a, b) => a - b));
    expect(await count(`SELECT count(*)::int AS n FROM water_tests WHERE farm_id = $1 AND source = 'import' AND analyte = 'nitrite' AND sampled_at >= '2026-01-01' AND sampled_at < '2026-01-20'`, [farmId])).toBe(20_000);
  }, 120_000);

  it('reads quoted delimiters, duplicate headers, semicolons with decimal commas and formula-looking cells as plain data', async () => {
    const csv =
      'Estanque;Fecha y hora;Parámetro;Método;Base;Valor;Notas;Notas\n' +
      'P5;15/06/2026 06:40;amonio;salicilato;NH3-N;0,35;"=HYPERLINK(""http://example.invalid"";""open"")";second note\n';
    const res = await upload(csv, 'registro.csv');
    expect(res.status).toBe(201);
    expect(res.body.delimiter).toBe(';');
    expect(res.body.headers).toEqual(['Estanque', 'Fecha y hora', 'Parámetro', 'Método', 'Base', 'Valor', 'Notas', 'Notas (2)']);
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('duplicate_header');
    const mapping = { ...res.body.suggestedMapping, basis: { column: 'Base' } };
    expect(mapping).toMatchObject({ unitCode: 'Estanque', sampledAt: { column: 'Fecha y hora' }, analyte: { column: 'Parámetro' }, value: 'Valor', note: 'Notas', dateOrder: 'dmy' });
    const importId = res.body.importId as string;
    await planner.post(url(importId, '/commit')).send({ mapping });
    const done = await until(importId, settled);
    expect(done.state).toBe('committed');
    const [row] = (await t.ds.query(`SELECT value, note, sampled_at FROM water_tests WHERE farm_id = $1 AND note LIKE '=HYPERLINK%'`, [farmId])) as Array<{
      value: number;
      note: string;
      sampled_at: Date;
    }>;
    expect(row).toMatchObject({ value: 0.35, note: '=HYPERLINK("http://example.invalid";"open")' });
    expect(row!.sampled_at.toISOString()).toBe('2026-06-15T11:40:00.000Z'); // 06:40 CDT (computed)

    // The formula is only data: the tests download neutralises it for spreadsheets.
    const exported = await planner.get(`/api/farms/${farmId}/exports/tests.csv`).query({ from: '2026-06-15T00:00:00Z', to: '2026-06-16T00:00:00Z' });
    expect(exported.status).toBe(200);
    expect(exported.text).toContain(`"'=HYPERLINK(""http://example.invalid"";""open"")"`);
  });
});

describe('refusing files that are not importable', () => {
  it('names the line of the first byte that is not UTF-8 in a Latin-1 file', async () => {
    const res = await upload(fixture('meter-log-latin1.csv'), 'meter-log.csv');
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('not_utf8');
    expect(res.body.error.message).toMatch(/not UTF-8 text: the byte 0xF1 at line 2/);
    expect(res.body.error.details).toMatchObject({ line: 2, byte: '0xF1' });
  });

  it('refuses a file whose first line is data instead of column names', async () => {
    const res = await upload('P1,2026-06-10 07:30,total_ammonia,salicylate,tan-n,0.8\nP2,2026-06-10 07:45,total_ammonia,salicylate,tan-n,1.1\n');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('missing_header');
    expect(res.body.error.message).toMatch(/looks like data/);
  });

  it('answers 413 in the error shape for a file over 20 MB and keeps nothing of it', async () => {
    const big = Buffer.alloc(20 * 1024 * 1024 + 1024, 'a');
    const res = await upload(big, 'huge.csv');
    expect(res.status).toBe(413);
    expect(res.body).toEqual({ error: { code: 'payload_too_large', message: expect.stringMatching(/larger than 20 MB/) } });
    const incoming = join(dataDir, 'uploads', 'imports', 'incoming');
    expect(readdirSync(incoming)).toEqual([]);
  });

  it('refuses a workbook, an unquoted quote that never closes, and an upload without the client header', async () => {
    const xlsx = await upload(Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00]), 'kits.xlsx', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
    expect(xlsx.status).toBe(415);
    expect(xlsx.body.error.code).toBe('spreadsheet_not_csv');

    const broken = await upload('unit,sampled_at,value,note\nP1,2026-06-10T07:30:00Z,0.5,"never closed\nP2,2026-06-10T07:40:00Z,0.6,x\n');
    expect(broken.status).toBe(400);
    expect(broken.body.error).toMatchObject({ code: 'csv_malformed', details: { line: 2 } });

    const noHeader = await planner.post(`/api/farms/${farmId}/imports`).attach('file', Buffer.from('a,b\n1,2\n'), 'x.csv');
    expect(noHeader.status).toBe(415);
  });

  it('refuses a mapping that names a column the file does not have', async () => {
    const res = await upload('unit_code,sampled_at,parameter,method,basis,value\nP1,2026-06-16T08:00:00Z,ph,meter,ph,7.4\n');
    const bad = await planner.post(url(res.body.importId as string, '/validate')).send({ mapping: { ...labMapping, note: 'comments' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/"comments"/);
  });

  it('answers 403 to a farm hand and 404 for an import of another farm', async () => {
    const hand = await signedIn(t.app, demoEmail('hand'));
    const res = await hand.post(`/api/farms/${farmId}/imports`).set('x-gillwise-client', 'web').attach('file', Buffer.from('a,b\n1,2\n'), 'x.csv');
    expect(res.status).toBe(403);
    const mine = await upload('unit_code,sampled_at,parameter,method,basis,value\nP1,2026-06-17T08:00:00Z,ph,meter,ph,7.2\n');
    const otherManager = await signedIn(t.app, 'manager@cedarflats.example');
    const otherFarm = seed.farms['cedar-flats']!;
    const crossed = await otherManager.get(`/api/farms/${otherFarm}/imports/${mine.body.importId as string}`);
    expect(crossed.status).toBe(404);
  });
});
