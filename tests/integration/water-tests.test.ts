import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { insertReadings, probeOf } from '../factories/readings';
import { signedIn } from '../factories/session';
import type { SeedResult } from '../../server/db/seed/seed';
import { Treatment } from '../../server/db/entities';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
const MIN = 60_000;

beforeAll(async () => {
  t = await startTestApp({ worker: true });
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
});
afterAll(() => t.close());

async function postTest(unitCode: string, body: Record<string, unknown>) {
  const agent = await signedIn(t.app, demoEmail('hand'));
  const unitId = seed.units[`harrow-bend:${unitCode}`]!;
  const res = await agent.post(`/api/farms/${farmId}/units/${unitId}/tests`).send({ clientId: randomUUID(), analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', ...body });
  return { agent, unitId, res };
}
async function resultOf(agent: Awaited<ReturnType<typeof signedIn>>, testId: string) {
  await t.drain({ queues: ['results'] });
  const res = await agent.get(`/api/farms/${farmId}/tests/${testId}`);
  expect(res.status).toBe(200);
  return res.body.result;
}

describe('a total-ammonia kit result becomes free ammonia in the worker', () => {
  it('interpolates the probe pH between the readings either side and records them as provenance', async () => {
    const unitId = seed.units['harrow-bend:P1']!;
    const probeId = await probeOf(t.ds, unitId);
    const at = new Date(Date.now() - 60 * MIN);
    await insertReadings(t.ds, [
      { probeId, quantity: 'ph', at: new Date(at.getTime() - 10 * MIN), value: 8.0 },
      { probeId, quantity: 'ph', at: new Date(at.getTime() + 10 * MIN), value: 8.4 },
      { probeId, quantity: 'ph', at: new Date(at.getTime() - 40 * MIN), value: 6.0 }, // outside the ±30 min window
      { probeId, quantity: 'water_temperature', at: new Date(at.getTime() - 2 * MIN), value: 24 },
    ]);
    const { agent, res } = await postTest('P1', { value: 1.0, sampledAt: at.toISOString() });
    expect(res.status).toBe(201);
    const result = await resultOf(agent, res.body.id);
    expect(result.status).toBe('ok');
    expect(result.method).toBe('emerson1975');
    expect(result.pH).toBeCloseTo(8.2, 6);
    // Emerson et al. 1975 via UF/IFAS FA16 table: 24 °C, pH 8.2 → 0.0772 (published)
    expect(Math.abs(result.fraction - 0.0772)).toBeLessThanOrEqual(0.00005);
    expect(result.nh3NMgL).toBeCloseTo(0.0772, 4);
    // NH3 = NH3-N × 1.21588 (computed from molar masses)
    expect(result.nh3MgL).toBeCloseTo(result.nh3NMgL * 1.21588, 10);
    const phUsed = result.provenance.values.find((v: { quantity: string }) => v.quantity === 'ph');
    expect(phUsed.source).toBe('probe_interpolated');
    expect(phUsed.readings.map((r: { value: number }) => r.value)).toEqual([8.0, 8.4]);
    expect(phUsed.probeLabel).toBe('P1 sonde');
  });

  it('uses the probe salinity and the salinity-corrected method in a brackish pond', async () => {
    const unitId = seed.units['harrow-bend:S1']!;
    const probeId = await probeOf(t.ds, unitId);
    const at = new Date(Date.now() - 30 * MIN);
    await insertReadings(t.ds, [
      { probeId, quantity: 'ph', at: new Date(at.getTime() - MIN), value: 8.2 },
      { probeId, quantity: 'water_temperature', at: new Date(at.getTime() - MIN), value: 24 },
      { probeId, quantity: 'salinity', at: new Date(at.getTime() - MIN), value: 35 },
    ]);
    const { agent, res } = await postTest('S1', { value: 1.0, sampledAt: at.toISOString() });
    const result = await resultOf(agent, res.body.id);
    expect(result.method).toBe('khoo1977');
    expect(result.salinityPpt).toBe(35);
    // Khoo, Culberson & Bates 1977: S 35, 24 °C, pH 8.2 → 0.06145 (computed, water-chemistry.md §2);
    // the printed full-seawater chart reads about 6.2 % (common practice, no source).
    expect(result.fraction).toBeCloseTo(0.06145, 4);
  });

  it('skips readings flagged suspect or bad and falls back to handheld values', async () => {
    const unitId = seed.units['harrow-bend:P3']!;
    const probeId = await probeOf(t.ds, unitId);
    const at = new Date(Date.now() - 20 * MIN);
    await insertReadings(t.ds, [
      { probeId, quantity: 'ph', at: new Date(at.getTime() - 2 * MIN), value: 10.5, quality: 'suspect' },
      { probeId, quantity: 'ph', at: new Date(at.getTime() + 2 * MIN), value: 11, quality: 'bad' },
      { probeId, quantity: 'water_temperature', at: new Date(at.getTime() - 2 * MIN), value: 20 },
    ]);
    const { agent, res } = await postTest('P3', { value: 2.0, sampledAt: at.toISOString(), handheldPh: 7.0 });
    const result = await resultOf(agent, res.body.id);
    expect(result.pH).toBe(7.0);
    expect(result.provenance.values.find((v: { quantity: string }) => v.quantity === 'ph').source).toBe('handheld');
    // Emerson et al. 1975 via UF/IFAS FA16 table: 20 °C, pH 7.0 → 0.0039 (published)
    expect(Math.abs(result.fraction - 0.0039)).toBeLessThanOrEqual(0.00005);
  });

  it('stores "needs pH" instead of a number when no pH is near and none was typed', async () => {
    const at = new Date(Date.now() - 3 * 24 * 60 * MIN);
    const { agent, res } = await postTest('P4', { value: 1.2, sampledAt: at.toISOString(), handheldTemperatureC: 25 });
    const result = await resultOf(agent, res.body.id);
    expect(result.status).toBe('needs_ph');
    expect(result.nh3MgL).toBeNull();
    expect(result.provenance.missing).toEqual(['ph']);
  });

  it('stores an offline resend with the same client id once', async () => {
    const agent = await signedIn(t.app, demoEmail('hand'));
    const unitId = seed.units['harrow-bend:P6']!;
    const body = { clientId: randomUUID(), analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: 0.5, handheldPh: 7.5, handheldTemperatureC: 22 };
    const first = await agent.post(`/api/farms/${farmId}/units/${unitId}/tests`).send(body);
    const second = await agent.post(`/api/farms/${farmId}/units/${unitId}/tests`).send(body);
    expect(first.status).toBe(201);
    expect(second.status).toBe(200);
    expect(second.body.id).toBe(first.body.id);
    const rows = (await t.ds.query('SELECT count(*)::int AS n FROM water_tests WHERE client_id = $1', [body.clientId])) as Array<{ n: number }>;
    expect(rows[0]?.n).toBe(1);
    await resultOf(agent, first.body.id);
    const results = (await t.ds.query('SELECT count(*)::int AS n FROM free_ammonia_results WHERE water_test_id = $1', [first.body.id])) as Array<{ n: number }>;
    expect(results[0]?.n).toBe(1);
  });

  it('flags a Nessler result taken after a formalin treatment, and not a salicylate one', async () => {
    const unitId = seed.units['harrow-bend:P2']!;
    await t.ds.getRepository(Treatment).save(
      t.ds.getRepository(Treatment).create({ farmId, unitId, product: 'formalin', startsAt: new Date(Date.now() - 30 * 60 * MIN), dose: 25, doseUnit: 'mg/L' }),
    );
    const nessler = await postTest('P2', { method: 'nessler', value: 1.5, handheldPh: 7.8, handheldTemperatureC: 26 });
    const salicylate = await postTest('P2', { method: 'salicylate', value: 0.9, handheldPh: 7.8, handheldTemperatureC: 26 });
    const flagged = await resultOf(nessler.agent, nessler.res.body.id);
    const clean = await resultOf(salicylate.agent, salicylate.res.body.id);
    expect(flagged.flags).toEqual([expect.objectContaining({ code: 'nessler_interference' })]);
    expect(flagged.flags[0].message).toMatch(/re-test with a salicylate kit/);
    expect(clean.flags).toEqual([]);
  });

  it('forecasts the afternoon peak from the diurnal pH curve and points out a morning-only test', async () => {
    const unitId = seed.units['harrow-bend:R1']!;
    const probeId = await probeOf(t.ds, unitId);
    // A seeded 72 h curve: pH 7.4 at dawn rising to 8.6 at 15:00 local (America/Chicago), temperature 26–30 °C.
    const rows = [];
    const now = Date.now();
    for (let m = 72 * 60; m > 0; m -= 15) {
      const at = new Date(now - m * MIN);
      const hour = Number(new Intl.DateTimeFormat('en-US', { timeZone: 'America/Chicago', hour: 'numeric', hourCycle: 'h23' }).format(at));
      const phase = Math.cos(((hour - 15) / 24) * 2 * Math.PI); // 1 at 15:00, −1 at 03:00
      rows.push({ probeId, quantity: 'ph', at, value: 8.0 + 0.6 * phase }, { probeId, quantity: 'water_temperature', at, value: 28 + 2 * phase });
    }
    await insertReadings(t.ds, rows);
    // A test at 08:00 local today.
    const local = new Intl.DateTimeFormat('en-CA', { timeZone: 'America/Chicago' }).format(new Date(now - 24 * 60 * MIN));
    const { zonedTime } = await import('../../shared/farm-time');
    const at = zonedTime(local, 8, 0, 'America/Chicago');
    const { agent, res } = await postTest('R1', { value: 1.0, sampledAt: at.toISOString() });
    const result = await resultOf(agent, res.body.id);
    expect(result.forecastPeak.localTime).toBe('15:30');
    expect(result.forecastPeak.nh3MgL).toBeGreaterThan(result.nh3MgL * 2);
    expect(result.forecastPeak.morningTestNote).toMatch(/Morning tests understate the afternoon peak/);
  });

  it('rejects a basis that does not fit the analyte and an impossible value, beside the fields', async () => {
    const { res } = await postTest('P1', { basis: 'no2-n', value: -1 });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(Object.keys(res.body.error.details.fieldErrors).sort()).toEqual(['basis', 'value']);
  });

  it('recomputes an edited result and audits the change with before and after', async () => {
    const { agent, unitId, res } = await postTest('P6', { value: 0.5, handheldPh: 8.0, handheldTemperatureC: 10 });
    await resultOf(agent, res.body.id);
    const manager = await signedIn(t.app, demoEmail('manager'));
    const edit = await manager.patch(`/api/farms/${farmId}/units/${unitId}/tests/${res.body.id}`).send({ value: 1.0, reason: 'misread the colour card' });
    expect(edit.status).toBe(200);
    expect(edit.body.version).toBe(2);
    const result = await resultOf(agent, res.body.id);
    expect(result.testVersion).toBe(2);
    // Emerson et al. 1975 via UF/IFAS FA16 table: 10 °C, pH 8.0 → 0.0182 (published)
    expect(result.nh3NMgL).toBeCloseTo(0.0182, 4);
    const audit = (await t.ds.query(`SELECT before, after FROM audit_events WHERE entity_id = $1`, [res.body.id])) as Array<{ before: { value: number }; after: { value: number; reason: string } }>;
    expect(audit[0]?.before.value).toBe(0.5);
    expect(audit[0]?.after).toMatchObject({ value: 1, reason: 'misread the colour card' });
  });
});
