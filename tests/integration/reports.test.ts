import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDays, hhmm, localParts, zonedTime } from '../../shared/farm-time';
import { WaterTest } from '../../server/db/entities';
import { insertReadings, type ReadingSpec } from '../factories/readings';
import { listMail, waitForMail } from '../setup/mail';
import { startTestApp, type TestApp } from '../setup/test-app';
import { createTestFarm, type TestFarmOptions } from '../factories/test-farm';

let t: TestApp;
const MIN = 60_000;
const HOUR = 60 * MIN;

beforeAll(async () => {
  t = await startTestApp({ worker: true });
});
afterAll(() => t.close());

// --- a farm of the test's own: people, profiles (the seeded defaults), units, probes ---

const makeFarm = (tag: string, opts: TestFarmOptions = {}) => createTestFarm(t, tag, opts);


/** A time zone where it is now between 11:00 and 21:00, so a whole night fits into today's local day. */
function daytimeZone(): string {
  const zones = ['America/Chicago', 'Europe/London', 'Asia/Tokyo', 'Pacific/Honolulu', 'Asia/Kolkata', 'America/Sao_Paulo', 'Pacific/Auckland'];
  const z = zones.find((tz) => {
    const h = localParts(new Date(), tz).hour;
    return h >= 11 && h < 21;
  });
  if (!z) throw new Error('no daytime zone found');
  return z;
}

describe('the morning report', () => {
  it('is built once per farm-local day from the night: lowest DO with its time, aerator hours, alarms and who acknowledged them, missed checks; e-mailed once to the managers', async () => {
    const tz = daytimeZone();
    const now = Date.now();
    // The night ended an hour ago and began ten hours before that (farm settings, farm-local).
    const dawn = localParts(now - HOUR, tz);
    const dusk = localParts(now - 11 * HOUR, tz);
    const today = dawn.day;
    const dawnAt = zonedTime(today, dawn.hour, dawn.minute, tz);
    const duskAt = zonedTime(dusk.day, dusk.hour, dusk.minute, tz);
    const f = await makeFarm('morning', { timeZone: tz, settings: { duskLocalTime: hhmm(dusk.hour, dusk.minute), dawnLocalTime: hhmm(dawn.hour, dawn.minute), morningReportLocalTime: '00:00' } });
    const manager = await f.person('manager', 'manager');
    const hand = await f.person('hand', 'hand');
    const pond = await f.unit('P1');
    const quiet = await f.unit('P2');
    const cycling = await f.unit('C1', { state: 'cycling' });
    const sonde = await f.probe(pond.id, ['dissolved_oxygen', 'aerator_running'], { intervalSeconds: 600, createdAt: new Date(now - 20 * HOUR) });
    const dead = await f.probe(quiet.id, ['water_temperature'], { intervalSeconds: 60, createdAt: new Date(now - 20 * HOUR) });

    // DO every 30 min through the night, lowest (3.1 mg/L) 7 h after dusk; the aerator runs for 3 h from then.
    const rows: ReadingSpec[] = [];
    for (let m = 0; m <= 600; m += 30) {
      const at = new Date(duskAt.getTime() + m * MIN);
      const value = m === 420 ? 3.1 : 3.6 + Math.abs(m - 420) / 100;
      rows.push({ probeId: sonde.id, quantity: 'dissolved_oxygen', at, value });
    }
    for (let m = 0; m <= 600; m += 10) {
      rows.push({ probeId: sonde.id, quantity: 'aerator_running', at: new Date(duskAt.getTime() + m * MIN), value: m >= 420 && m < 600 ? 1 : 0 });
    }
    rows.push({ probeId: sonde.id, quantity: 'dissolved_oxygen', at: new Date(now - 2 * MIN), value: 7.5 }, { probeId: sonde.id, quantity: 'aerator_running', at: new Date(now - 2 * MIN), value: 0 });
    await insertReadings(t.ds, rows);
    await t.ds.getRepository(WaterTest).save(
      t.ds.getRepository(WaterTest).create({ farmId: f.farmId, unitId: cycling.id, clientId: randomUUID(), analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: 0.4, unit: 'mg/L', sampledAt: zonedTime(addDays(today, -3), 9, 0, tz), source: 'pondside', version: 1 }),
    );
    // An alarm of the night, acknowledged by the hand.
    const alertId = randomUUID();
    await t.ds.query(
      `INSERT INTO alerts (id, farm_id, unit_id, kind, level, state, condition_key, title, message, opened_at, last_seen_at)
       VALUES ($1, $2, $3, 'do_low', 'act', 'open', $4, 'Dissolved oxygen low in P1', 'DO 3.1 mg/L', $5, $5)`,
      [alertId, f.farmId, pond.id, `do_low:test:${alertId}`, new Date(duskAt.getTime() + 7 * HOUR)],
    );
    expect((await (await hand.agent()).post(`/api/farms/${f.farmId}/alerts/${alertId}/acknowledge`).send({})).status).toBe(200);
    // The sweep opens the missed checks: the silent probe and the overdue daily test.
    await t.queues.add('sweepFarms', { farmId: f.farmId });
    await t.drain();

    await t.queues.add('morningReport', {});
    await t.drain();
    const [mail] = await waitForMail({ to: manager.email, where: (m) => m.subject.includes('Morning report') });
    expect(mail?.subject).toBe(`[Gillwise] Morning report ${today}: ${f.farm.name}`);
    expect(mail?.text).toMatch(/P1 .*: 3\.1 mg\/L at/);

    const res = await (await hand.agent()).get(`/api/farms/${f.farmId}/reports/morning`).query({ day: today });
    expect(res.status).toBe(200);
    const report = res.body;
    expect(report).toMatchObject({ stored: true, day: today, mailedTo: [manager.email] });
    const p1 = report.content.units.find((u: { code: string }) => u.code === 'P1');
    const lowAt = new Date(duskAt.getTime() + 420 * MIN);
    expect(p1.lowestDo).toMatchObject({ doMgL: 3.1, source: 'probe', at: lowAt.toISOString(), localTime: hhmm(localParts(lowAt, tz).hour, localParts(lowAt, tz).minute) });
    // 18 readings of "running", 10 min apart: 3.0 h (computed).
    expect(p1.aeratorHours).toBeCloseTo(3.0, 6);
    expect(report.content.aerators).toEqual([{ unitId: pond.id, code: 'P1', hours: 3 }]);
    // Alarms from dusk to the report time: the night's one, acknowledged, and what the sweep just found.
    expect(report.content.alarms).toEqual(expect.arrayContaining([expect.objectContaining({ alertId, kind: 'do_low', acknowledgedBy: { id: hand.id, name: hand.name } })]));
    expect(report.content.alarms.map((a: { kind: string }) => a.kind)).toEqual(expect.arrayContaining(['do_low', 'test_overdue', 'probe_silent']));
    expect(report.content.missedChecks.testsOverdue.map((x: { code: string }) => x.code)).toEqual(['C1']);
    expect(report.content.missedChecks.silentProbes.map((x: { probeId: string }) => x.probeId)).toEqual([dead.id]);
    expect(report.content.night).toMatchObject({ from: duskAt.toISOString(), to: dawnAt.toISOString() });

    // Run again: still one report, still one e-mail.
    await t.queues.add('morningReport', {});
    await t.queues.add('morningReport', { farmId: f.farmId, day: today });
    await t.drain();
    await new Promise((r) => setTimeout(r, 300));
    const rowsStored = (await t.ds.query(`SELECT count(*)::int AS n FROM morning_reports WHERE farm_id = $1`, [f.farmId])) as Array<{ n: number }>;
    expect(rowsStored[0]?.n).toBe(1);
    expect((await listMail({ to: manager.email })).filter((m) => m.subject.includes('Morning report'))).toHaveLength(1);
    const outbox = (await t.ds.query(`SELECT kind FROM outbox_messages WHERE related_id = $1`, [report.id])) as Array<{ kind: string }>;
    expect(outbox).toEqual([{ kind: 'digest' }]);
    const days = (await (await manager.agent()).get(`/api/farms/${f.farmId}/reports/morning/days`)).body;
    expect(days.reports).toEqual([expect.objectContaining({ day: today, alarms: report.content.alarms.length, mailedTo: [manager.email] })]);
  });

  it('answers a preview for a day that has no stored report', async () => {
    const f = await makeFarm('preview');
    const planner = await f.person('planner', 'planner');
    await f.unit('P1');
    const day = addDays(localParts(new Date(), 'America/Chicago').day, -5);
    const res = await (await planner.agent()).get(`/api/farms/${f.farmId}/reports/morning`).query({ day });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id: null, stored: false, day, mailedTo: [] });
    expect(res.body.content.units).toEqual([expect.objectContaining({ code: 'P1', lowestDo: null, aeratorHours: null })]);
  });
});
