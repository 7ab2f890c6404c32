import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDays, hhmm, localParts, zonedTime } from '../../shared/farm-time';
import { ProbeMaintenanceWindow, Treatment, WaterTest } from '../../server/db/entities';
import { insertReadings } from '../factories/readings';
import { signedIn } from '../factories/session';
import { listMail, waitForMail } from '../setup/mail';
import { startTestApp, type TestApp } from '../setup/test-app';
import { createTestFarm, type TestFarmOptions } from '../factories/test-farm';
import type { AlertDto } from '../../shared/schemas/alerts.schema';

let t: TestApp;
const MIN = 60_000;
const HOUR = 60 * MIN;

beforeAll(async () => {
  t = await startTestApp({ worker: true });
});
afterAll(() => t.close());

// --- a farm of the test's own: people, profiles (the seeded defaults), units, probes ---

const makeFarm = (tag: string, opts: TestFarmOptions = {}) => createTestFarm(t, tag, opts);

type Agent = Awaited<ReturnType<typeof signedIn>>;

async function sweep(farmId: string) {
  await t.queues.add('sweepFarms', { farmId });
  await t.drain();
}

async function kitTest(agent: Agent, farmId: string, unitId: string, body: Record<string, unknown>) {
  const res = await agent
    .post(`/api/farms/${farmId}/units/${unitId}/tests`)
    .send({ clientId: randomUUID(), analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', handheldPh: 8.2, handheldTemperatureC: 24, ...body });
  expect(res.status).toBe(201);
  await t.drain();
  return res.body;
}

async function alertsOf(agent: Agent, farmId: string, query: Record<string, string>) {
  const res = await agent.get(`/api/farms/${farmId}/alerts`).query({ state: 'all', ...query });
  expect(res.status).toBe(200);
  return res.body.alerts as AlertDto[];
}

// Emerson et al. 1975 via UF/IFAS FA16 table: 24 °C, pH 8.2 → NH3-N fraction 0.0772 (published);
// NH3 = NH3-N × 1.21588 (computed from molar masses): 0.09387 mg/L NH3 per mg/L TAN.
const NH3_PER_TAN = 0.0772 * 1.21588;

describe('alert lifecycle from kit results', () => {
  it('opens one act-level alert for a persisting high free ammonia, acknowledges it, and resolves it only past the hysteresis margin', async () => {
    const f = await makeFarm('nh3');
    const hand = await f.person('hand', 'hand');
    const manager = await f.person('manager', 'manager');
    const pond = await f.unit('P1');
    const agent = await hand.agent();

    await kitTest(agent, f.farmId, pond.id, { value: 1.0 }); // ≈ 0.094 mg/L NH3, above the 0.05 act limit
    let list = await alertsOf(agent, f.farmId, { unitId: pond.id, kind: 'nh3_high' });
    expect(list).toHaveLength(1);
    const alert = list[0]!;
    expect(alert).toMatchObject({ level: 'act', state: 'open', unitCode: 'P1' });
    expect(alert.values.value as number).toBeCloseTo(1.0 * NH3_PER_TAN, 3);
    expect(alert.rule).toMatchObject({ metric: 'nh3', threshold: 0.05, watch: 0.02, act: 0.05, basis: 'mg/L NH3', clearsAt: 0.019 });
    expect(alert.rule.source).toMatch(/common practice/);
    expect(alert.message).toMatch(/above the act limit of 0\.050 mg\/L NH3/);

    await kitTest(agent, f.farmId, pond.id, { value: 1.2 });
    list = await alertsOf(agent, f.farmId, { unitId: pond.id, kind: 'nh3_high' });
    expect(list).toHaveLength(1);

    // Nobody is on call on this farm: the first e-mail goes to the managers.
    const [mail] = await waitForMail({ to: manager.email });
    expect(mail?.subject).toContain('ACT: Free ammonia high');

    const ack = await agent.post(`/api/farms/${f.farmId}/alerts/${alert.id}/acknowledge`).send({});
    expect(ack.status).toBe(200);
    expect(ack.body).toMatchObject({ state: 'acknowledged', acknowledgedBy: { id: hand.id } });

    // 0.0195 mg/L NH3: inside the 0.02 watch limit, but not past 0.019 (5 % margin): stays open.
    await kitTest(agent, f.farmId, pond.id, { value: 0.0195 / NH3_PER_TAN });
    let one = (await agent.get(`/api/farms/${f.farmId}/alerts/${alert.id}`)).body;
    expect(one.alert.state).toBe('acknowledged');

    await kitTest(agent, f.farmId, pond.id, { value: 0.1 }); // ≈ 0.0094 mg/L NH3
    one = (await agent.get(`/api/farms/${f.farmId}/alerts/${alert.id}`)).body;
    expect(one.alert).toMatchObject({ state: 'resolved', resolvedBy: null });
    expect(one.alert.resolutionNote).toMatch(/clear margin/);
    const types = one.events.map((e: { type: string }) => e.type);
    expect(types.filter((x: string) => x === 'opened')).toHaveLength(1);
    expect(types).toEqual(expect.arrayContaining(['opened', 'notified', 'acknowledged', 'resolved']));
  });

  it('records a watch → act upgrade as an event on the same alert', async () => {
    const f = await makeFarm('upgrade');
    const hand = await f.person('hand', 'hand');
    await f.person('manager', 'manager');
    const pond = await f.unit('P2');
    const agent = await hand.agent();
    await kitTest(agent, f.farmId, pond.id, { value: 0.03 / NH3_PER_TAN });
    let [a] = await alertsOf(agent, f.farmId, { unitId: pond.id, kind: 'nh3_high' });
    expect(a?.level).toBe('watch');
    await kitTest(agent, f.farmId, pond.id, { value: 1.0 });
    const list = await alertsOf(agent, f.farmId, { unitId: pond.id, kind: 'nh3_high' });
    expect(list).toHaveLength(1);
    a = list[0];
    expect(a?.level).toBe('act');
    const events = (await agent.get(`/api/farms/${f.farmId}/alerts/${a!.id}`)).body.events;
    expect(events.find((e: { type: string }) => e.type === 'escalated_level')?.details).toMatchObject({ from: 'watch', to: 'act' });
  });

  it('re-alerts an acknowledged alert that is still open after the farm’s re-alert minutes', async () => {
    const f = await makeFarm('realert');
    const hand = await f.person('hand', 'hand');
    const onDuty = await f.person('hand', 'onduty');
    await f.onCall([{ userId: onDuty.id }]);
    const pond = await f.unit('P3');
    const agent = await hand.agent();
    await kitTest(agent, f.farmId, pond.id, { value: 1.0 });
    const [a] = await alertsOf(agent, f.farmId, { unitId: pond.id, kind: 'nh3_high' });
    await waitForMail({ to: onDuty.email });
    await agent.post(`/api/farms/${f.farmId}/alerts/${a!.id}/acknowledge`).send({ note: 'cutting feed' });
    // The re-alert time (acknowledgement + realertMinutes) has passed while the free ammonia stays high.
    await t.ds.query(`UPDATE alerts SET realert_at = now() - interval '1 second' WHERE id = $1`, [a!.id]);
    await sweep(f.farmId);
    const one = (await agent.get(`/api/farms/${f.farmId}/alerts/${a!.id}`)).body;
    expect(one.alert).toMatchObject({ state: 'open', acknowledgedBy: null });
    expect(one.events.map((e: { type: string }) => e.type)).toContain('realerted');
    const mails = await waitForMail({ to: onDuty.email, count: 2 });
    expect(mails[0]?.subject).toContain('Still open');
  });

  it('flags a Nessler result taken after formalin as kit interference (watch)', async () => {
    const f = await makeFarm('nessler');
    const hand = await f.person('hand', 'hand');
    await f.person('manager', 'manager');
    const pond = await f.unit('P4');
    await t.ds.getRepository(Treatment).save(t.ds.getRepository(Treatment).create({ farmId: f.farmId, unitId: pond.id, product: 'formalin', startsAt: new Date(Date.now() - 30 * HOUR), dose: 25, doseUnit: 'mg/L' }));
    const agent = await hand.agent();
    await kitTest(agent, f.farmId, pond.id, { value: 0.05, method: 'nessler' });
    const [a] = await alertsOf(agent, f.farmId, { unitId: pond.id, kind: 'kit_interference' });
    expect(a).toMatchObject({ level: 'watch', state: 'open' });
    expect(a!.message).toMatch(/re-test with a salicylate kit/);
  });

  it('lets a hand acknowledge but not resolve; a manager resolves by hand with a note and assigns to a person of the farm', async () => {
    const f = await makeFarm('roles');
    const hand = await f.person('hand', 'hand');
    const planner = await f.person('planner', 'planner');
    const manager = await f.person('manager', 'manager');
    const other = await makeFarm('roles-other');
    const outsider = await other.person('hand', 'outsider');
    const pond = await f.unit('P5');
    const handAgent = await hand.agent();
    await kitTest(handAgent, f.farmId, pond.id, { value: 1.0 });
    const [a] = await alertsOf(handAgent, f.farmId, { unitId: pond.id, kind: 'nh3_high' });
    const base = `/api/farms/${f.farmId}/alerts/${a!.id}`;
    expect((await (await planner.agent()).post(`${base}/acknowledge`).send({})).status).toBe(403);
    expect((await handAgent.post(`${base}/resolve`).send({ note: 'done' })).status).toBe(403);
    const m = await manager.agent();
    expect((await m.post(`${base}/assign`).send({ userId: outsider.id })).status).toBe(400);
    const assigned = await m.post(`${base}/assign`).send({ userId: hand.id });
    expect(assigned.body.assignedTo).toEqual({ id: hand.id, name: hand.name });
    const [mail] = await waitForMail({ to: hand.email, where: (x) => x.subject.includes('Assigned to you') });
    expect(mail?.text).toContain(`/farms/${f.farmId}/alerts?alertId=${a!.id}`);
    expect((await m.post(`${base}/resolve`).send({})).status).toBe(400);
    const resolved = await m.post(`${base}/resolve`).send({ note: 'water exchanged, feed withheld' });
    expect(resolved.body).toMatchObject({ state: 'resolved', resolvedBy: { id: manager.id }, resolutionNote: 'water exchanged, feed withheld' });
    expect((await handAgent.post(`${base}/acknowledge`).send({})).status).toBe(409);
  });
});

describe('silence, maintenance and fallow units', () => {
  it('raises one farm_silent alarm when no probe of the farm reports, not one per probe', async () => {
    const f = await makeFarm('silent-farm');
    const manager = await f.person('manager', 'manager');
    const probes = [];
    for (const code of ['R1', 'R2']) {
      const u = await f.unit(code, { species: 'rainbow_trout', kind: 'raceway' });
      const p = await f.probe(u.id, ['water_temperature', 'flow'], { createdAt: new Date(Date.now() - 2 * HOUR) });
      probes.push(p);
      await insertReadings(t.ds, [{ probeId: p.id, quantity: 'water_temperature', at: new Date(Date.now() - 30 * MIN), value: 14 }]);
    }
    await sweep(f.farmId);
    const agent = await manager.agent();
    const active = await alertsOf(agent, f.farmId, { state: 'active' });
    expect(active.filter((a) => a.kind === 'farm_silent')).toEqual([expect.objectContaining({ level: 'act', unitId: null })]);
    expect(active.filter((a) => a.kind === 'probe_silent')).toEqual([]);
    const summary = (await agent.get(`/api/farms/${f.farmId}/alerts/summary`)).body;
    expect(summary.farmSilent).toBe(true);
    expect(summary.units.map((u: { status: string }) => u.status)).toEqual(['silent', 'silent']);
    const status = (await agent.get(`/api/farms/${f.farmId}/status`)).body;
    expect(status.units.map((u: { status: string }) => u.status)).toEqual(['silent', 'silent']);

    // One probe reports again: the farm alarm clears and the other probe is silent on its own.
    await insertReadings(t.ds, [{ probeId: probes[0]!.id, quantity: 'water_temperature', at: new Date(), value: 14 }]);
    await sweep(f.farmId);
    const after = await alertsOf(agent, f.farmId, { state: 'active' });
    expect(after.filter((a) => a.kind === 'farm_silent')).toEqual([]);
    expect(after.filter((a) => a.kind === 'probe_silent').map((a) => a.probeId)).toEqual([probes[1]!.id]);
  });

  it('does not raise probe_silent for a probe in a maintenance window', async () => {
    const f = await makeFarm('maintenance');
    const manager = await f.person('manager', 'manager');
    const make = async (code: string, lastMinutesAgo: number) => {
      const u = await f.unit(code);
      const p = await f.probe(u.id, ['water_temperature'], { createdAt: new Date(Date.now() - 3 * HOUR) });
      await insertReadings(t.ds, [{ probeId: p.id, quantity: 'water_temperature', at: new Date(Date.now() - lastMinutesAgo * MIN), value: 26 }]);
      return { u, p };
    };
    const cleaning = await make('P1', 40);
    const lost = await make('P2', 40);
    await make('P3', 1);
    await t.ds.getRepository(ProbeMaintenanceWindow).save(
      t.ds.getRepository(ProbeMaintenanceWindow).create({ probeId: cleaning.p.id, startsAt: new Date(Date.now() - HOUR), endsAt: new Date(Date.now() + HOUR), reason: 'cleaning the DO membrane', createdById: manager.id }),
    );
    await sweep(f.farmId);
    const agent = await manager.agent();
    const silent = (await alertsOf(agent, f.farmId, { state: 'active', kind: 'probe_silent' })).map((a) => a.probeId);
    expect(silent).toEqual([lost.p.id]);
    const evaluation = (await agent.get(`/api/farms/${f.farmId}/units/${cleaning.u.id}/evaluation`)).body;
    const check = evaluation.checks.find((c: { kind: string }) => c.kind === 'probe_silent');
    expect(check).toMatchObject({ verdict: 'clear' });
    expect(check.note).toMatch(/maintenance window/);
    const summary = (await agent.get(`/api/farms/${f.farmId}/alerts/summary`)).body;
    const statusOf = (id: string) => summary.units.find((u: { unitId: string }) => u.unitId === id).status;
    expect(statusOf(lost.u.id)).toBe('silent');
    expect(statusOf(cleaning.u.id)).toBe('clear');
  });

  it('lets a fallow unit raise nothing, and resolves what it had open', async () => {
    const f = await makeFarm('fallow');
    const manager = await f.person('manager', 'manager');
    const hand = await f.person('hand', 'hand');
    const pond = await f.unit('P6');
    const p = await f.probe(pond.id, ['dissolved_oxygen'], { createdAt: new Date(Date.now() - 3 * HOUR) });
    await insertReadings(t.ds, [{ probeId: p.id, quantity: 'dissolved_oxygen', at: new Date(Date.now() - MIN), value: 1.2 }]);
    const agent = await hand.agent();
    await kitTest(agent, f.farmId, pond.id, { value: 1.0 });
    await sweep(f.farmId);
    // The DO sensor was never calibrated, so calibration_due is open too (probe health rules).
    expect((await alertsOf(agent, f.farmId, { state: 'active', unitId: pond.id })).map((a) => a.kind).sort()).toEqual(['calibration_due', 'do_low', 'nh3_high']);

    await t.ds.query(`UPDATE culture_units SET state = 'fallow' WHERE id = $1`, [pond.id]);
    await sweep(f.farmId);
    expect(await alertsOf(agent, f.farmId, { state: 'active', unitId: pond.id })).toEqual([]);
    const resolved = await alertsOf(agent, f.farmId, { state: 'resolved', unitId: pond.id });
    expect(resolved.every((a) => /fallow/.test(a.resolutionNote ?? ''))).toBe(true);
    const evaluation = (await (await manager.agent()).get(`/api/farms/${f.farmId}/units/${pond.id}/evaluation`)).body;
    expect(evaluation).toMatchObject({ fallow: true, checks: [], status: 'clear' });
  });
});

describe('routine tests and the night', () => {
  it('counts an overdue ammonia test in the farm’s own days (Pacific/Kiritimati, UTC+14)', async () => {
    const tz = 'Pacific/Kiritimati';
    const f = await makeFarm('overdue', { timeZone: tz });
    const manager = await f.person('manager', 'manager');
    const today = localParts(new Date(), tz).day;
    const testedYesterday = await f.unit('C1', { state: 'cycling' });
    const testedTwoDaysAgo = await f.unit('C2', { state: 'cycling' });
    const test = (unitId: string, sampledAt: Date) =>
      t.ds.getRepository(WaterTest).save(
        t.ds.getRepository(WaterTest).create({ farmId: f.farmId, unitId, clientId: randomUUID(), analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: 0.2, unit: 'mg/L', sampledAt, source: 'pondside', version: 1 }),
      );
    // Yesterday 00:30 local is the day before yesterday in UTC; a daily test is due today, not overdue.
    await test(testedYesterday.id, zonedTime(addDays(today, -1), 0, 30, tz));
    // Two local days ago, 23:30: due yesterday, so overdue today.
    await test(testedTwoDaysAgo.id, zonedTime(addDays(today, -2), 23, 30, tz));
    await sweep(f.farmId);
    const overdue = await alertsOf(await manager.agent(), f.farmId, { state: 'active', kind: 'test_overdue' });
    expect(overdue.map((a) => a.unitId)).toEqual([testedTwoDaysAgo.id]);
    expect(overdue[0]).toMatchObject({ level: 'watch', values: { dueDay: addDays(today, -1), daysOverdue: 1, everyDays: 1 } });
  });

  it('projects dawn oxygen from the night’s readings and raises "projected below 4.0 mg/L by HH:MM"', async () => {
    const tz = 'America/Chicago';
    // Dusk 2 h 10 min ago and dawn 10 h after dusk (farm settings), so it is night now.
    const duskParts = localParts(Date.now() - 130 * MIN, tz);
    const duskAt = zonedTime(duskParts.day, duskParts.hour, duskParts.minute, tz);
    const dawnParts = localParts(duskAt.getTime() + 10 * HOUR, tz);
    const f = await makeFarm('dawn', { timeZone: tz, settings: { duskLocalTime: hhmm(duskParts.hour, duskParts.minute), dawnLocalTime: hhmm(dawnParts.hour, dawnParts.minute) } });
    const manager = await f.person('manager', 'manager');
    const pond = await f.unit('P7');
    const p = await f.probe(pond.id, ['dissolved_oxygen'], { intervalSeconds: 900, createdAt: new Date(Date.now() - 6 * HOUR) });
    await insertReadings(t.ds, [
      { probeId: p.id, quantity: 'dissolved_oxygen', at: new Date(duskAt.getTime() - 30 * MIN), value: 11.5 }, // before dusk: photosynthesis, not used
      { probeId: p.id, quantity: 'dissolved_oxygen', at: duskAt, value: 9.0 },
      { probeId: p.id, quantity: 'dissolved_oxygen', at: new Date(duskAt.getTime() + 2 * HOUR), value: 7.8 },
    ]);
    await sweep(f.farmId);
    const agent = await manager.agent();
    const [a] = await alertsOf(agent, f.farmId, { state: 'active', kind: 'do_projected_low' });
    // Boyd, Romaire & Johnston 1978 via UF/IFAS FA27 (computed): 9.0 at 0 h and 7.8 at 2 h → 3.0 mg/L at 10 h; crosses 4.0 at 8.333 h.
    const crosses = localParts(duskAt.getTime() + (25 / 3) * HOUR, tz);
    expect(a).toBeDefined();
    expect(a!.level).toBe('watch');
    expect(a!.message).toContain(`projected below 4.0 mg/L by ${hhmm(crosses.hour, crosses.minute)}`);
    const v = a!.values as { linear: { doAtDawnMgL: number }; logLinear: { doAtDawnMgL: number }; lower: string; readingsUsed: Array<{ doMgL: number }> };
    expect(v.linear.doAtDawnMgL).toBeCloseTo(3.0, 3);
    // Madenjian, Rogers & Fast 1987 form (computed): 9.0 × (7.8 / 9.0)^5 = 4.4005 mg/L.
    expect(v.logLinear.doAtDawnMgL).toBeCloseTo(4.4005, 3);
    expect(v.lower).toBe('linear');
    expect(v.readingsUsed.map((r) => r.doMgL)).toEqual([9, 7.8]);
    const evaluation = (await agent.get(`/api/farms/${f.farmId}/units/${pond.id}/evaluation`)).body;
    expect(evaluation.night).toBe(true);
    expect(evaluation.dawnProjection).toMatchObject({ thresholdMgL: 4, lower: 'linear', basedOn: 'probe', crossesLocalTime: hhmm(crosses.hour, crosses.minute) });
  });
});

describe('the unit evaluation', () => {
  it('shows US EPA 2013 criteria as reference lines for a trout raceway, never as an alarm', async () => {
    const f = await makeFarm('epa');
    const manager = await f.person('manager', 'manager');
    const raceway = await f.unit('R1', { species: 'rainbow_trout', kind: 'raceway' });
    const shrimp = await f.unit('S1', { species: 'whiteleg_shrimp', waterType: 'brackish', salinityPpt: 18 });
    const p = await f.probe(raceway.id, ['ph', 'water_temperature'], { createdAt: new Date(Date.now() - HOUR) });
    await insertReadings(t.ds, [
      { probeId: p.id, quantity: 'ph', at: new Date(Date.now() - MIN), value: 7.0 },
      { probeId: p.id, quantity: 'water_temperature', at: new Date(Date.now() - MIN), value: 20 },
    ]);
    const agent = await manager.agent();
    const ev = (await agent.get(`/api/farms/${f.farmId}/units/${raceway.id}/evaluation`)).body;
    // US EPA 2013, EPA 822-R-13-001 (published): CMC 17 and CCC 1.9 mg TAN/L at pH 7, 20 °C (2 significant figures).
    expect(ev.reference.epa2013).toMatchObject({ applicable: true, oncorhynchusPresent: true, pH: 7, temperatureC: 20 });
    expect(Number(ev.reference.epa2013.cmcMgL.toPrecision(2))).toBe(17);
    expect(Number(ev.reference.epa2013.cccMgL.toPrecision(2))).toBe(1.9);
    expect(ev.profile.name).toMatch(/Rainbow trout/);
    expect(ev.checks.find((c: { kind: string }) => c.kind === 'ph_low')).toMatchObject({ verdict: 'clear', value: 7 });
    const brackish = (await agent.get(`/api/farms/${f.farmId}/units/${shrimp.id}/evaluation`)).body;
    expect(brackish.reference.epa2013.applicable).toBe(false);
    expect(await listMail({ to: manager.email })).toEqual([]);
  });
});
