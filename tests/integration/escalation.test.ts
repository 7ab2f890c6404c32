import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hhmm, localParts } from '../../shared/farm-time';
import { insertReadings } from '../factories/readings';
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


async function sweep(farmId: string) {
  await t.queues.add('sweepFarms', { farmId });
  await t.drain();
}

/** Makes the next escalation step due now (as if escalationMinutes had passed) and runs the tick. */
async function escalationDue(alertId: string) {
  await t.ds.query(`UPDATE alerts SET next_escalation_at = now() - interval '1 second' WHERE id = $1 AND next_escalation_at IS NOT NULL`, [alertId]);
  await t.queues.add('escalateAlerts', {});
  await t.drain();
}

/** A raceway whose flow probe reads 0 L/min now: flow_lost at act level after a sweep. */
async function flowCut(f: Awaited<ReturnType<typeof makeFarm>>, code: string) {
  const raceway = await f.unit(code, { species: 'rainbow_trout', kind: 'raceway' });
  const probe = await f.probe(raceway.id, ['flow'], { createdAt: new Date(Date.now() - HOUR) });
  await insertReadings(t.ds, [
    { probeId: probe.id, quantity: 'flow', at: new Date(Date.now() - 20 * MIN), value: 2600 },
    { probeId: probe.id, quantity: 'flow', at: new Date(Date.now() - 30_000), value: 0 },
  ]);
  await sweep(f.farmId);
  const rows = (await t.ds.query(`SELECT id FROM alerts WHERE farm_id = $1 AND unit_id = $2 AND kind = 'flow_lost'`, [f.farmId, raceway.id])) as Array<{ id: string }>;
  expect(rows).toHaveLength(1);
  return { raceway, probe, alertId: rows[0]!.id };
}

const settle = () => new Promise((r) => setTimeout(r, 300));

describe('escalation along the on-call list', () => {
  it('e-mails the first person on call, then the next when nobody acknowledges, and stops at the first acknowledgement', async () => {
    const f = await makeFarm('walk');
    const first = await f.person('hand', 'first');
    const second = await f.person('hand', 'second');
    const third = await f.person('manager', 'third');
    await f.onCall([{ userId: first.id }, { userId: second.id }, { userId: third.id }]);
    const { alertId } = await flowCut(f, 'R3');

    const [toFirst] = await waitForMail({ to: first.email });
    expect(toFirst?.subject).toMatch(/ACT: Flow lost/);
    expect(toFirst?.text).toMatch(/Acknowledge it in Gillwise/);
    await settle();
    expect(await listMail({ to: second.email })).toEqual([]);

    await escalationDue(alertId);
    const [toSecond] = await waitForMail({ to: second.email });
    expect(toSecond?.subject).toMatch(/Escalated, not acknowledged after 15 min/);

    const ack = await (await second.agent()).post(`/api/farms/${f.farmId}/alerts/${alertId}/acknowledge`).send({ note: 'opening the valve' });
    expect(ack.body).toMatchObject({ state: 'acknowledged', nextEscalationAt: null });
    await escalationDue(alertId);
    await t.queues.add('escalateAlerts', {});
    await t.drain();
    await settle();
    expect(await listMail({ to: third.email })).toEqual([]);
    expect(await listMail({ to: first.email })).toHaveLength(1);

    const detail = (await (await third.agent()).get(`/api/farms/${f.farmId}/alerts/${alertId}`)).body;
    const steps = detail.events.map((e: { type: string; user: { id: string } | null; details: { recipients?: Array<{ userId: string }> } }) => [e.type, e.details.recipients?.map((r) => r.userId) ?? e.user?.id ?? null]);
    expect(steps).toEqual([
      ['opened', null],
      ['notified', [first.id]],
      ['escalated', [second.id]],
      ['acknowledged', second.id],
    ]);
    const outbox = (await t.ds.query(`SELECT kind, to_address, status FROM outbox_messages WHERE related_id = $1 ORDER BY created_at`, [alertId])) as Array<{ kind: string; to_address: string; status: string }>;
    expect(outbox).toEqual([
      { kind: 'alert', to_address: first.email, status: 'sent' },
      { kind: 'escalation', to_address: second.email, status: 'sent' },
    ]);
  });

  it('skips people whose hours do not cover now, e-mails the managers after the last one, then stops', async () => {
    const f = await makeFarm('wrap');
    const onDuty = await f.person('hand', 'onduty');
    const offDuty = await f.person('hand', 'offduty');
    const manager = await f.person('manager', 'manager');
    const h = localParts(new Date(), 'America/Chicago').hour;
    await f.onCall([{ userId: onDuty.id }, { userId: offDuty.id, startsLocal: hhmm((h + 2) % 24, 0), endsLocal: hhmm((h + 3) % 24, 0) }]);
    const { alertId } = await flowCut(f, 'R1');
    await waitForMail({ to: onDuty.email });
    await escalationDue(alertId);
    const [toManager] = await waitForMail({ to: manager.email });
    expect(toManager?.subject).toMatch(/Escalated/);
    const row = ((await t.ds.query(`SELECT next_escalation_at, state FROM alerts WHERE id = $1`, [alertId])) as Array<{ next_escalation_at: Date | null; state: string }>)[0];
    expect(row).toEqual({ next_escalation_at: null, state: 'open' });
    await t.queues.add('escalateAlerts', {});
    await t.drain();
    await settle();
    expect(await listMail({ to: offDuty.email })).toEqual([]);
    expect(await listMail({ to: manager.email })).toHaveLength(1);
    const last = (await (await manager.agent()).get(`/api/farms/${f.farmId}/alerts/${alertId}`)).body.events.at(-1);
    expect(last.details).toMatchObject({ managers: true, stopped: true });
  });

  it('sends a notification step once, however often its job runs', async () => {
    const f = await makeFarm('once');
    const onDuty = await f.person('hand', 'onduty');
    await f.onCall([{ userId: onDuty.id }]);
    const { alertId } = await flowCut(f, 'R2');
    await waitForMail({ to: onDuty.email });
    const again = await t.services.escalation.deliver({ alertId, step: 1, reason: 'opened', farmId: f.farmId });
    expect(again.skipped).toBe('already sent');
    await settle();
    expect(await listMail({ to: onDuty.email })).toHaveLength(1);
  });

  it('opens one alert when several workers evaluate the same unit at once', async () => {
    const f = await makeFarm('race');
    await f.person('manager', 'manager');
    const pond = await f.unit('P1');
    const probe = await f.probe(pond.id, ['dissolved_oxygen'], { createdAt: new Date(Date.now() - HOUR) });
    await insertReadings(t.ds, [{ probeId: probe.id, quantity: 'dissolved_oxygen', at: new Date(Date.now() - 30_000), value: 1.8 }]);
    await Promise.all(Array.from({ length: 6 }, () => t.services.unitEvaluation.evaluateAndApply(f.farmId, pond.id)));
    await t.drain();
    const rows = (await t.ds.query(`SELECT id, level FROM alerts WHERE unit_id = $1 AND kind = 'do_low'`, [pond.id])) as Array<{ id: string; level: string }>;
    expect(rows).toEqual([{ id: expect.any(String), level: 'act' }]);
    const opened = (await t.ds.query(`SELECT count(*)::int AS n FROM alert_events WHERE alert_id = $1 AND type = 'opened'`, [rows[0]!.id])) as Array<{ n: number }>;
    expect(opened[0]?.n).toBe(1);
  });
});

describe('the on-call list API', () => {
  it('replaces the list in order for a manager, refuses people of other farms and hands', async () => {
    const f = await makeFarm('oncall');
    const manager = await f.person('manager', 'manager');
    const hand = await f.person('hand', 'hand');
    const stranger = await (await makeFarm('oncall-other')).person('hand', 'stranger');
    const m = await manager.agent();
    const bad = await m.put(`/api/farms/${f.farmId}/on-call`).send({ entries: [{ userId: stranger.id }] });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.details.fieldErrors)).toEqual(['entries.0.userId']);
    const put = await m.put(`/api/farms/${f.farmId}/on-call`).send({ entries: [{ userId: hand.id, startsLocal: '18:00', endsLocal: '06:00' }, { userId: manager.id }] });
    expect(put.status).toBe(200);
    expect(put.body.entries.map((e: { position: number; userId: string; role: string }) => [e.position, e.userId, e.role])).toEqual([
      [1, hand.id, 'hand'],
      [2, manager.id, 'manager'],
    ]);
    expect(put.body.afterList).toBe('managers_then_stop');
    expect([hand.id, manager.id]).toContain(put.body.firstNow.userId);
    expect((await (await hand.agent()).get(`/api/farms/${f.farmId}/on-call`)).status).toBe(403);
    const audit = (await t.ds.query(`SELECT action FROM audit_events WHERE farm_id = $1 AND entity = 'on_call_list'`, [f.farmId])) as Array<{ action: string }>;
    expect(audit).toEqual([{ action: 'on_call.updated' }]);
  });
});
