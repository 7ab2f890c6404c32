import { randomUUID } from 'node:crypto';
import { createServer, get } from 'node:http';
import { parse } from 'csv-parse/sync';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readingsCsvColumns } from '../../shared/schemas/exports.schema';
import type { SeedResult } from '../../server/db/seed/seed';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { insertReadings, probeOf, type ReadingSpec } from '../factories/readings';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
const MIN = 60_000;

beforeAll(async () => {
  t = await startTestApp({ worker: true });
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
}, 120_000);
afterAll(() => t.close());

/** Reads a whole CSV body (BOM and CRLF included) into rows of cells. */
const rowsOf = (text: string) => parse(text, { bom: true, relax_column_count: false }) as string[][];

/** Collects a streamed response as text, chunk by chunk. */
function download(agent: Awaited<ReturnType<typeof signedIn>>, path: string, query: Record<string, string>) {
  return agent
    .get(path)
    .query(query)
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = [];
      let count = 0;
      res.on('data', (c: Buffer) => {
        chunks.push(c);
        count++;
      });
      res.on('end', () => done(null, { text: Buffer.concat(chunks).toString('utf8'), chunks: count }));
    });
}

describe('CSV downloads', () => {
  it('streams the readings of a range, one row per probe sample, with UTC and farm-local times and units in the column names', async () => {
    const unitId = seed.units['harrow-bend:P4']!;
    const probeId = await probeOf(t.ds, unitId);
    const start = Date.parse('2026-09-01T00:00:00Z');
    const readings: ReadingSpec[] = [];
    // Five days of minute data (7200 samples × 3 quantities): more than one cursor batch.
    for (let m = 0; m < 7200; m++) {
      const at = new Date(start + m * MIN);
      readings.push(
        { probeId, quantity: 'ph', at, value: 7.5 + (m % 10) / 100 },
        { probeId, quantity: 'water_temperature', at, value: m === 0 ? -0.5 : 22 },
        { probeId, quantity: 'dissolved_oxygen', at, value: 6.2, quality: m === 1 ? 'suspect' : 'good' },
      );
    }
    for (let i = 0; i < readings.length; i += 5000) await insertReadings(t.ds, readings.slice(i, i + 5000));

    const viewer = await signedIn(t.app, demoEmail('hand'));
    const from = '2026-09-01T00:00:00Z';
    const to = '2026-09-04T00:00:00Z';
    const res = await download(viewer, `/api/farms/${farmId}/exports/readings.csv`, { unitId, from, to });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toBe('attachment; filename="harrow-bend_p4_readings_2026-08-31_2026-09-03.csv"');
    const body = res.body as { text: string; chunks: number };
    expect(body.chunks).toBeGreaterThan(1);
    const rows = rowsOf(body.text);
    const [header, first, second] = rows;
    expect(header).toEqual(readingsCsvColumns.map((c) => (c === 'time_local' ? 'time_local (America/Chicago)' : c)));
    expect(rows.length - 1).toBe(3 * 24 * 60); // [from, to) of minute samples
    const col = (name: string) => header!.indexOf(name);
    expect(first![col('time_utc')]).toBe('2026-09-01T00:00:00.000Z');
    expect(first![col('time_local (America/Chicago)')]).toBe('2026-08-31 19:00:00'); // CDT, UTC−5 (computed)
    expect(first![col('unit_code')]).toBe('P4');
    // A negative number stays a number: no quote prefix.
    expect(first![col('water_temperature_c')]).toBe('-0.5');
    expect(first![col('ph')]).toBe('7.5');
    expect(first![col('dissolved_oxygen_mg_l')]).toBe('6.2');
    expect(first![col('flow_l_min')]).toBe('');
    expect(second![col('flags')]).toBe('dissolved_oxygen:suspect');
    expect(rows.at(-1)![col('time_utc')]).toBe('2026-09-03T23:59:00.000Z');
  });

  it('escapes text cells that start like a formula and leaves numeric cells numeric', async () => {
    const unitId = seed.units['harrow-bend:P6']!;
    const probeId = await probeOf(t.ds, unitId);
    await t.ds.query(`UPDATE probes SET label = '@SUM(1+1)*cmd' WHERE id = $1`, [probeId]);
    await insertReadings(t.ds, [{ probeId, quantity: 'water_temperature', at: new Date('2026-09-10T12:00:00Z'), value: -1.25 }]);
    const agent = await signedIn(t.app, demoEmail('planner'));
    const res = await download(agent, `/api/farms/${farmId}/exports/readings.csv`, { unitId, from: '2026-09-10T00:00:00Z', to: '2026-09-11T00:00:00Z' });
    const [header, row] = rowsOf((res.body as { text: string }).text);
    expect(row![header!.indexOf('probe_label')]).toBe("'@SUM(1+1)*cmd");
    expect(row![header!.indexOf('water_temperature_c')]).toBe('-1.25');
  });

  it('exports kit results and their computed free ammonia with the sources of pH and temperature', async () => {
    const hand = await signedIn(t.app, demoEmail('hand'));
    const unitId = seed.units['harrow-bend:P3']!;
    const sampledAt = '2026-09-20T13:00:00.000Z';
    const post = await hand
      .post(`/api/farms/${farmId}/units/${unitId}/tests`)
      .send({ clientId: randomUUID(), analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: 1.0, sampledAt, handheldPh: 8.2, handheldTemperatureC: 24, note: '-2 fish floating' });
    expect(post.status).toBe(201);
    await t.drain({ queues: ['results'] });
    const range = { unitId, from: '2026-09-20T00:00:00Z', to: '2026-09-21T00:00:00Z' };

    const tests = rowsOf((await download(hand, `/api/farms/${farmId}/exports/tests.csv`, range)).body.text as string);
    expect(tests).toHaveLength(2);
    const th = tests[0]!;
    expect(tests[1]![th.indexOf('note')]).toBe("'-2 fish floating");
    expect(tests[1]![th.indexOf('value')]).toBe('1');
    expect(tests[1]![th.indexOf('value_unit')]).toBe('mg/L');
    expect(tests[1]![th.indexOf('entered_by')]).toBe('Marisol Ortega');

    const results = rowsOf((await download(hand, `/api/farms/${farmId}/exports/results.csv`, range)).body.text as string);
    expect(results).toHaveLength(2);
    const rh = results[0]!;
    const r = results[1]!;
    expect(r[rh.indexOf('status')]).toBe('ok');
    expect(r[rh.indexOf('ph_source')]).toBe('handheld');
    expect(r[rh.indexOf('temperature_source')]).toBe('handheld');
    expect(r[rh.indexOf('salinity_source')]).toBe('unit_default');
    // Emerson et al. 1975 via UF/IFAS FA16 table: 24 °C, pH 8.2 → 0.0772 (published)
    expect(Number(r[rh.indexOf('nh3_fraction')])).toBeCloseTo(0.0772, 4);
    expect(r[rh.indexOf('test_id')]).toBe(post.body.id);
  });

  it('closes the cursor and frees the connection when the client goes away mid-download', async () => {
    const unitId = seed.units['harrow-bend:R2']!;
    const probeId = await probeOf(t.ds, unitId);
    const start = Date.parse('2026-10-01T00:00:00Z');
    const rows: ReadingSpec[] = [];
    for (let m = 0; m < 20_000; m++) rows.push({ probeId, quantity: 'ph', at: new Date(start + m * MIN), value: 7.4 });
    for (let i = 0; i < rows.length; i += 5000) await insertReadings(t.ds, rows.slice(i, i + 5000));
    const login = await request(t.app).post('/api/auth/login').send({ email: demoEmail('manager'), password: 'gillwise-demo' });
    const cookie = (login.headers['set-cookie'] as unknown as string[])[0]!.split(';')[0]!;
    const server = createServer(t.app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
    const port = (server.address() as { port: number }).port;
    const exporting = async () =>
      ((await t.ds.query(`SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = current_database() AND query ~ '^(FETCH|DECLARE) .*gw_export'`)) as Array<{ n: number }>)[0]!.n;
    let openWhilePaused = 0;
    try {
      await new Promise<void>((resolve, reject) => {
        const req = get(
          { host: '127.0.0.1', port, path: `/api/farms/${farmId}/exports/readings.csv?unitId=${unitId}&from=2026-10-01T00:00:00Z&to=2026-10-20T00:00:00Z`, headers: { cookie } },
          (res) => {
            expect(res.statusCode).toBe(200);
            res.once('data', () => {
              // Stop reading: backpressure holds the export mid-cursor, then the client goes away.
              res.pause();
              void (async () => {
                const deadline = Date.now() + 3000;
                while ((await exporting()) === 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
                openWhilePaused = await exporting();
                req.destroy();
                resolve();
              })();
            });
          },
        );
        req.on('error', (err) => (err.message.includes('socket hang up') ? resolve() : reject(err)));
      });
      expect(openWhilePaused).toBe(1);
      const deadline = Date.now() + 5000;
      while ((await exporting()) > 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
      expect(await exporting()).toBe(0);
    } finally {
      await new Promise<void>((r) => {
        server.close(() => r());
        server.closeAllConnections();
      });
    }
  });

  it('answers in the error shape for a unit of another farm and a range that is too long', async () => {
    const agent = await signedIn(t.app, demoEmail('manager'));
    const otherUnit = seed.units['cedar-flats:T1']!;
    const crossed = await agent.get(`/api/farms/${farmId}/exports/tests.csv`).query({ unitId: otherUnit });
    expect(crossed.status).toBe(404);
    expect(crossed.body.error.code).toBe('not_found');
    const long = await agent.get(`/api/farms/${farmId}/exports/readings.csv`).query({ from: '2024-01-01T00:00:00Z', to: '2026-01-01T00:00:00Z' });
    expect(long.status).toBe(400);
    expect(long.body.error.code).toBe('validation_failed');
    const anonymous = await request(t.app).get(`/api/farms/${farmId}/exports/readings.csv`);
    expect(anonymous.status).toBe(401);
  });
});
