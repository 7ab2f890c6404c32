import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SeedResult } from '../../server/db/seed/seed';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
let otherFarmId: string;
let managerId: string;
let handId: string;
type Agent = Awaited<ReturnType<typeof signedIn>>;
let manager: Agent;
let admin: Agent;

beforeAll(async () => {
  t = await startTestApp();
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  otherFarmId = seed.farms['cedar-flats']!;
  const ids = (await t.ds.query(`SELECT id, email FROM users WHERE email IN ($1, $2)`, [
    demoEmail('manager'),
    demoEmail('hand'),
  ])) as Array<{ id: string; email: string }>;
  managerId = ids.find((u) => u.email === demoEmail('manager'))!.id;
  handId = ids.find((u) => u.email === demoEmail('hand'))!.id;
  [manager, admin] = await Promise.all([signedIn(t.app, demoEmail('manager')), signedIn(t.app, demoEmail('admin'))]);
});
afterAll(() => t.close());

type Item = {
  id: string;
  at: string;
  action: string;
  entity: string;
  entityId: string | null;
  actor: { id: string; name: string } | null;
  before: unknown;
  after: unknown;
};

describe('audit trail', () => {
  it('records who changed what and when, with the record before and after, and lists it newest first', async () => {
    const entityId = randomUUID();
    await t.services.audit.record({
      farmId,
      actorId: managerId,
      action: 'threshold_profile.updated',
      entity: 'threshold_profile',
      entityId,
      before: { act: 0.05 },
      after: { act: 0.03 },
    });
    await t.services.audit.record({
      farmId,
      actorId: null,
      action: 'threshold_profile.recomputed',
      entity: 'threshold_profile',
      entityId,
      before: null,
      after: { at: new Date('2026-01-02T03:04:05Z') },
    });
    const res = await manager.get(`/api/farms/${farmId}/audit`).query({ entityId });
    expect(res.status).toBe(200);
    const items = res.body.items as Item[];
    expect(items.map((i) => i.action)).toEqual(['threshold_profile.recomputed', 'threshold_profile.updated']);
    expect(items[1]).toMatchObject({
      entity: 'threshold_profile',
      actor: { id: managerId, name: 'Dale Whitcomb' },
      before: { act: 0.05 },
      after: { act: 0.03 },
    });
    expect(items[0]).toMatchObject({ actor: null, before: null, after: { at: '2026-01-02T03:04:05.000Z' } });
    expect(Date.parse(items[0]!.at)).toBeGreaterThanOrEqual(Date.parse(items[1]!.at));
  });

  it('filters by entity, actor and time, and pages with a cursor without repeating or skipping entries', async () => {
    const entity = `test_${randomUUID().slice(0, 8)}`;
    const base = Date.parse('2026-02-01T00:00:00Z');
    for (let i = 0; i < 7; i++) {
      await t.services.audit.record({
        farmId,
        actorId: i % 2 ? handId : managerId,
        action: `${entity}.changed`,
        entity,
        entityId: String(i),
        at: new Date(base + i * 3600_000),
        before: { n: i - 1 },
        after: { n: i },
      });
    }
    const byHand = await manager.get(`/api/farms/${farmId}/audit`).query({ entity, actorId: handId });
    expect(byHand.body.items.map((i: Item) => i.entityId)).toEqual(['5', '3', '1']);
    const window = await manager
      .get(`/api/farms/${farmId}/audit`)
      .query({ entity, from: new Date(base + 2 * 3600_000).toISOString(), to: new Date(base + 5 * 3600_000).toISOString() });
    expect(window.body.items.map((i: Item) => i.entityId)).toEqual(['4', '3', '2']);

    const seen: string[] = [];
    let cursor: string | null = null;
    do {
      const page = await manager.get(`/api/farms/${farmId}/audit`).query({ entity, limit: 3, ...(cursor ? { cursor } : {}) });
      expect(page.status).toBe(200);
      expect(page.body.items.length).toBeLessThanOrEqual(3);
      seen.push(...page.body.items.map((i: Item) => i.entityId!));
      cursor = page.body.nextCursor as string | null;
    } while (cursor);
    expect(seen).toEqual(['6', '5', '4', '3', '2', '1', '0']);
  });

  it("keeps each farm's trail to itself", async () => {
    const entityId = randomUUID();
    await t.services.audit.record({
      farmId: otherFarmId,
      actorId: null,
      action: 'unit.updated',
      entity: 'unit',
      entityId,
      before: { a: 1 },
      after: { a: 2 },
    });
    const mine = await manager.get(`/api/farms/${farmId}/audit`).query({ entityId });
    expect(mine.body.items).toEqual([]);
    const theirs = await admin.get(`/api/farms/${otherFarmId}/audit`).query({ entityId });
    expect(theirs.body.items).toHaveLength(1);
    expect((await manager.get(`/api/farms/${otherFarmId}/audit`)).status).toBe(404);
  });

  it('is for managers and admins only: hands and planners get 403', async () => {
    for (const role of ['hand', 'planner'] as const) {
      const agent = await signedIn(t.app, demoEmail(role));
      expect((await agent.get(`/api/farms/${farmId}/audit`)).status).toBe(403);
    }
  });

  it('answers 400 for a cursor it did not issue and for a reversed time range', async () => {
    const bad = await manager.get(`/api/farms/${farmId}/audit`).query({ cursor: 'bm90LWEtY3Vyc29y' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fieldErrors.cursor).toBeDefined();
    const reversed = await manager.get(`/api/farms/${farmId}/audit`).query({ from: '2026-02-02T00:00:00Z', to: '2026-02-01T00:00:00Z' });
    expect(reversed.status).toBe(400);
    expect(reversed.body.error.details.fieldErrors.from).toBeDefined();
  });
});
