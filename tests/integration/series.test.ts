import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SeedResult } from '../../server/db/seed/seed';
import { seriesSql } from '../../server/modules/readings/readings.repository';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { createProbe } from '../factories/probes';
import { insertReadings } from '../factories/readings';
import { signedIn } from '../factories/session';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
let otherFarmId: string;
type Agent = Awaited<ReturnType<typeof signedIn>>;
let manager: Agent;
let hand: Agent;
let otherManager: Agent;

const MIN = 60_000;
const DAY = 86_400_000;
type PlanNode = { 'Node Type': string; 'Index Name'?: string; Plans?: PlanNode[] };
type Point = { t: string; avg: number; min: number; max: number; n: number; suspect: number };

beforeAll(async () => {
  t = await startTestApp();
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  otherFarmId = seed.farms['cedar-flats']!;
  [manager, hand, otherManager] = await Promise.all([
    signedIn(t.app, demoEmail('manager')),
    signedIn(t.app, demoEmail('hand')),
    signedIn(t.app, demoEmail('manager', 'cedarflats')),
  ]);
});
afterAll(() => t.close());

async function unitWithProbe(quantities = ['ph', 'water_temperature']) {
  const res = await manager
    .post(`/api/farms/${farmId}/units`)
    .send({ code: `S${randomUUID().slice(0, 6)}`, name: 'Series unit', kind: 'pond' });
  expect(res.status).toBe(201);
  const probe = await createProbe(t.ds, farmId, res.body.id, quantities);
  return { unitId: res.body.id as string, probeId: probe.probeId };
}

/** One reading a minute in [from, from + minutes), a diurnal pH wave, every `suspectEvery`-th flagged suspect. */
async function generate(probeId: string, quantity: string, from: Date, minutes: number, suspectEvery = 0): Promise<void> {
  await t.ds.query(
    `INSERT INTO readings (probe_id, quantity, at, value, quality)
     SELECT $1, $2, $3::timestamptz + make_interval(mins => i),
            7.6 + 0.6 * sin(2 * pi() * i / 1440.0) + (i % 7) * 0.01,
            CASE WHEN $5 > 0 AND i % $5 = 0 THEN 'suspect' ELSE 'good' END
     FROM generate_series(0, $4 - 1) AS i`,
    [probeId, quantity, from, minutes, suspectEvery],
  );
}

const floorToMinute = (ms: number) => new Date(Math.floor(ms / MIN) * MIN);

describe('unit series', () => {
  it('downsamples 50 000 readings in SQL to at most maxPoints buckets, each with min ≤ avg ≤ max and its suspect count', async () => {
    const { unitId, probeId } = await unitWithProbe();
    const from = floorToMinute(Date.now() - 50_000 * MIN);
    await generate(probeId, 'ph', from, 50_000, 100);
    const to = new Date(from.getTime() + 50_000 * MIN);
    for (const maxPoints of [2000, 500, 37]) {
      const res = await hand
        .get(`/api/farms/${farmId}/units/${unitId}/series`)
        .query({ quantities: 'ph', from: from.toISOString(), to: to.toISOString(), maxPoints });
      expect(res.status).toBe(200);
      const [s] = res.body.series as Array<{ quantity: string; unit: string; bucketSeconds: number; readings: number; points: Point[] }>;
      expect(s).toMatchObject({ quantity: 'ph', unit: 'pH', readings: 50_000 });
      expect(s!.bucketSeconds).toBeGreaterThan(0);
      expect(s!.points.length).toBeLessThanOrEqual(maxPoints);
      expect(s!.points.length).toBeGreaterThan(maxPoints / 5);
      expect(s!.points.reduce((sum, p) => sum + p.n, 0)).toBe(50_000);
      expect(s!.points.reduce((sum, p) => sum + p.suspect, 0)).toBe(500);
      for (const p of s!.points) {
        expect(p.min).toBeLessThanOrEqual(p.avg + 1e-9);
        expect(p.avg).toBeLessThanOrEqual(p.max + 1e-9);
        expect(Date.parse(p.t) % (s!.bucketSeconds * 1000)).toBe(0); // epoch-aligned buckets
      }
      const times = s!.points.map((p) => Date.parse(p.t));
      expect([...times].sort((a, b) => a - b)).toEqual(times);
    }
  });

  it('answers raw readings (bucketSeconds 0) when the range holds no more than maxPoints', async () => {
    const { unitId, probeId } = await unitWithProbe();
    const from = floorToMinute(Date.now() - 3 * 3600_000);
    await generate(probeId, 'ph', from, 180);
    await insertReadings(t.ds, [
      { probeId, quantity: 'water_temperature', at: new Date(from.getTime() + 5 * MIN), value: 26.5, quality: 'suspect' },
    ]);
    const res = await hand
      .get(`/api/farms/${farmId}/units/${unitId}/series`)
      .query({ from: from.toISOString(), to: new Date(from.getTime() + 180 * MIN).toISOString() });
    expect(res.status).toBe(200);
    // No quantities asked: every quantity of the unit's probes, in a stable order.
    const byQ = Object.fromEntries(res.body.series.map((s: { quantity: string }) => [s.quantity, s]));
    expect(Object.keys(byQ)).toEqual(['ph', 'water_temperature']);
    expect(byQ.ph).toMatchObject({ bucketSeconds: 0, readings: 180 });
    expect(byQ.ph.points).toHaveLength(180);
    expect(byQ.ph.points[0]).toMatchObject({ t: from.toISOString(), n: 1, suspect: 0 });
    expect(byQ.water_temperature.points).toEqual([
      { t: new Date(from.getTime() + 5 * MIN).toISOString(), avg: 26.5, min: 26.5, max: 26.5, n: 1, suspect: 1 },
    ]);
  });

  it('uses only the probes of the unit asked for', async () => {
    const a = await unitWithProbe(['dissolved_oxygen']);
    const b = await unitWithProbe(['dissolved_oxygen']);
    const at = floorToMinute(Date.now() - 30 * MIN);
    await insertReadings(t.ds, [
      { probeId: a.probeId, quantity: 'dissolved_oxygen', at, value: 6 },
      { probeId: b.probeId, quantity: 'dissolved_oxygen', at, value: 2 },
    ]);
    const res = await hand.get(`/api/farms/${farmId}/units/${a.unitId}/series`).query({ quantities: 'dissolved_oxygen' });
    expect(res.body.probeIds).toEqual([a.probeId]);
    expect(res.body.series[0].points).toEqual([{ t: at.toISOString(), avg: 6, min: 6, max: 6, n: 1, suspect: 0 }]);
  });

  it('answers 400 with clear messages for a reversed range, more than 400 days, an unknown quantity or too many points', async () => {
    const { unitId } = await unitWithProbe();
    const url = `/api/farms/${farmId}/units/${unitId}/series`;
    const now = Date.now();
    const iso = (ms: number) => new Date(ms).toISOString();
    const reversed = await hand.get(url).query({ from: iso(now), to: iso(now - DAY) });
    expect(reversed.status).toBe(400);
    expect(reversed.body.error.details.fieldErrors.from[0]).toMatch(/before/);
    const long = await hand.get(url).query({ from: iso(now - 401 * DAY), to: iso(now) });
    expect(long.status).toBe(400);
    expect(long.body.error.details.fieldErrors.from[0]).toMatch(/400 days/);
    const unknown = await hand.get(url).query({ quantities: 'ph,ammonia' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details.fieldErrors.quantities).toBeDefined();
    const many = await hand.get(url).query({ maxPoints: 5000 });
    expect(many.status).toBe(400);
    expect(many.body.error.details.fieldErrors.maxPoints).toBeDefined();
    const badTime = await hand.get(url).query({ from: 'yesterday' });
    expect(badTime.status).toBe(400);
  });

  it("answers 404 for another farm's unit", async () => {
    const { unitId } = await unitWithProbe();
    expect((await otherManager.get(`/api/farms/${otherFarmId}/units/${unitId}/series`)).status).toBe(404);
    expect((await otherManager.get(`/api/farms/${farmId}/units/${unitId}/series`)).status).toBe(404);
  });

  it('reads 1 day and 90 days of minute data through range scans of the reading primary key, never a table scan', async () => {
    const { unitId, probeId } = await unitWithProbe();
    const neighbour = await unitWithProbe();
    const from = floorToMinute(Date.now() - 90 * DAY);
    // 90 days of minute data, as ingest writes it: this probe's pH interleaved in time with four
    // series of a neighbouring probe, 648 000 rows in all.
    await t.ds.query(
      `INSERT INTO readings (probe_id, quantity, at, value, quality)
       SELECT s.probe_id, s.quantity, $3::timestamptz + make_interval(mins => i), 7 + random(), 'good'
       FROM generate_series(0, 90 * 1440 - 1) AS i,
            (VALUES ($1::uuid, 'ph'), ($2::uuid, 'ph'), ($2::uuid, 'water_temperature'), ($2::uuid, 'dissolved_oxygen'), ($2::uuid, 'salinity')) AS s(probe_id, quantity)
       ORDER BY i`,
      [probeId, neighbour.probeId, from],
    );
    await t.ds.query('VACUUM ANALYZE readings');
    const to = new Date(from.getTime() + 90 * DAY);
    const probeIds = [probeId];
    const plans: Array<{ name: string; sql: string; params: unknown[] }> = [];
    for (const days of [1, 90]) {
      const start = new Date(to.getTime() - days * DAY);
      const res = await hand
        .get(`/api/farms/${farmId}/units/${unitId}/series`)
        .query({ quantities: 'ph', from: start.toISOString(), to: to.toISOString() });
      const [s] = res.body.series;
      expect(s.readings).toBe(days * 1440);
      expect(s.points.length).toBeLessThanOrEqual(2000);
      expect(s.bucketSeconds).toBe(days === 1 ? 0 : 3600 * 2);
      const range = [probeIds, 'ph', start, to];
      plans.push({ name: `count ${days} d`, sql: seriesSql.countUpTo, params: [...range, 2001] });
      plans.push(
        days === 1
          ? { name: 'raw 1 d', sql: seriesSql.raw, params: range }
          : { name: 'buckets 90 d', sql: seriesSql.buckets, params: [...range, s.bucketSeconds, '1970-01-01T00:00:00Z'] },
      );
    }
    for (const { name, sql, params } of plans) {
      const rows = (await t.ds.query(`EXPLAIN (FORMAT JSON) ${sql}`, params)) as Array<{ 'QUERY PLAN': Array<{ Plan: PlanNode }> }>;
      const nodes: PlanNode[] = [];
      const walk = (n: PlanNode) => {
        nodes.push(n);
        for (const c of n.Plans ?? []) walk(c);
      };
      walk(rows[0]!['QUERY PLAN'][0]!.Plan);
      const scans = nodes.filter((n) => /Scan/.test(n['Node Type']) && n['Node Type'] !== 'Function Scan');
      expect(
        scans.some((n) => n['Index Name'] === 'pk_readings'),
        name,
      ).toBe(true);
      expect(
        scans.filter((n) => n['Node Type'] === 'Seq Scan' || n['Index Name'] === 'brin_readings_at'),
        name,
      ).toEqual([]);
    }
  });
});
