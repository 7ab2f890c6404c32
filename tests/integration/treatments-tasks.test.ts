import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import type { SeedResult } from '../../server/db/seed/seed';
import { CultureUnit, WaterTest } from '../../server/db/entities';
import { zonedTime, localDay, addDays } from '../../shared/farm-time';

let t: TestApp;
let seed: SeedResult;
let farmId: string;

beforeAll(async () => {
  t = await startTestApp();
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
});
afterAll(() => t.close());

describe('treatments and withdrawal', () => {
  it('marks the unit in withdrawal until a day-based period ends', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const unitId = seed.units['harrow-bend:P3']!;
    const startsAt = new Date(Date.now() - 2 * 86_400_000).toISOString();
    const res = await manager.post(`/api/farms/${farmId}/units/${unitId}/treatments`).send({ product: 'copper', productName: 'Copper sulfate (demo)', dose: 1, doseUnit: 'mg/L', startsAt, withdrawalDays: 10 });
    expect(res.status).toBe(201);
    expect(res.body.withdrawal).toMatchObject({ inWithdrawal: true, basis: 'days', estimate: 'fixed' });
    const list = await manager.get(`/api/farms/${farmId}/units/${unitId}/treatments`);
    expect(list.body.withdrawal.inWithdrawal).toBe(true);
    expect(Date.parse(list.body.withdrawal.endsAt)).toBeCloseTo(Date.parse(startsAt) + 10 * 86_400_000, -3);
    const status = await t.services.treatments.withdrawalStatus(farmId, unitId, new Date(Date.parse(startsAt) + 11 * 86_400_000));
    expect(status.inWithdrawal).toBe(false);
  });

  it('refuses both days and degree-days, and an end before the start, beside the fields', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const unitId = seed.units['harrow-bend:P3']!;
    const res = await manager
      .post(`/api/farms/${farmId}/units/${unitId}/treatments`)
      .send({ product: 'formalin', startsAt: '2026-05-02T10:00:00Z', endsAt: '2026-05-01T10:00:00Z', withdrawalDays: 5, withdrawalDegreeDays: 500 });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.details.fieldErrors).sort()).toEqual(['endsAt', 'withdrawalDegreeDays']);
  });

  it('answers 404 for a unit of another farm', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const foreign = seed.units['cedar-flats:T1']!;
    const res = await manager.get(`/api/farms/${farmId}/units/${foreign}/treatments`);
    expect(res.status).toBe(404);
  });
});

describe('observations', () => {
  it('puts a unit on closer watch after dead fish are seen, so its test is due daily', async () => {
    const hand = await signedIn(t.app, demoEmail('hand'));
    const unitId = seed.units['harrow-bend:P6']!;
    const res = await hand.post(`/api/farms/${farmId}/units/${unitId}/observations`).send({ kind: 'dead_fish', count: 14, detail: 'along the north bank' });
    expect(res.status).toBe(201);
    expect(Date.parse(res.body.closeWatchUntil)).toBeGreaterThan(Date.now() + 6 * 86_400_000);
    const tasks = await hand.get(`/api/farms/${farmId}/tasks`);
    const p6 = tasks.body.tests.find((x: { code: string }) => x.code === 'P6');
    expect(p6.everyDays).toBe(1);
    expect(p6.reason).toMatch(/closer watch/);
  });
});

describe("the hand's test list", () => {
  it('lists a weekly test as overdue in the farm time zone, a cycling pond daily, and no fallow unit', async () => {
    const tz = 'America/Chicago';
    const now = new Date();
    const today = localDay(now, tz);
    const p1 = seed.units['harrow-bend:P1']!;
    const p4 = seed.units['harrow-bend:P4']!;
    await t.ds.getRepository(CultureUnit).update({ id: p4 }, { state: 'fallow' });
    // P1: last tested 8 local days ago at 23:30 (a time that is already the next day in UTC) → 1 day overdue.
    const eightDaysAgo = zonedTime(addDays(today, -8), 23, 30, tz);
    await t.ds.getRepository(WaterTest).delete({ unitId: p1 });
    await t.ds.getRepository(WaterTest).save(
      t.ds.getRepository(WaterTest).create({ farmId, unitId: p1, clientId: crypto.randomUUID(), analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: 0.5, unit: 'mg/L', sampledAt: eightDaysAgo }),
    );
    const { tests, day, timeZone } = await t.services.tasks.testsDue(farmId, now);
    expect(day).toBe(today);
    expect(timeZone).toBe(tz);
    const byCode = Object.fromEntries(tests.map((x) => [x.code, x]));
    expect(byCode.P1).toMatchObject({ status: 'overdue', daysOverdue: 1, everyDays: 7, dueDay: addDays(today, -1) });
    expect(byCode.P5?.everyDays).toBe(1);
    expect(byCode.P4).toBeUndefined();
    // Overdue and due first, then in walking order.
    const statuses = tests.map((x) => x.status);
    expect(statuses.indexOf('upcoming') === -1 || statuses.lastIndexOf('overdue') < statuses.indexOf('upcoming')).toBe(true);
  });
});
