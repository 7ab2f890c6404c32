import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { defaultFarmSettings } from '../../server/db/entities';
import type { SeedResult } from '../../server/db/seed/seed';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { createProbe } from '../factories/probes';
import { insertReadings } from '../factories/readings';
import { signedIn } from '../factories/session';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
type Agent = Awaited<ReturnType<typeof signedIn>>;
let manager: Agent;
let hand: Agent;
let planner: Agent;
let admin: Agent;

beforeAll(async () => {
  t = await startTestApp();
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  [manager, hand, planner, admin] = await Promise.all([
    signedIn(t.app, demoEmail('manager')),
    signedIn(t.app, demoEmail('hand')),
    signedIn(t.app, demoEmail('planner')),
    signedIn(t.app, demoEmail('admin')),
  ]);
});
afterAll(() => t.close());

const slug = () => `test-${randomUUID().slice(0, 8)}`;

describe('farms', () => {
  it("lists a member's own farms with their role, and every farm for an admin", async () => {
    const mine = await hand.get('/api/farms');
    expect(mine.status).toBe(200);
    expect(mine.body.farms).toEqual([
      expect.objectContaining({ id: farmId, slug: 'harrow-bend', role: 'hand', timeZone: 'America/Chicago' }),
    ]);
    const all = await admin.get('/api/farms');
    expect(all.body.farms.map((f: { slug: string }) => f.slug)).toEqual(expect.arrayContaining(['harrow-bend', 'cedar-flats']));
    expect(all.body.farms.every((f: { role: string }) => f.role === 'admin')).toBe(true);
  });

  it('answers a farm with every setting, the stored ones merged over the defaults', async () => {
    const res = await planner.get(`/api/farms/${farmId}`);
    expect(res.status).toBe(200);
    expect(res.body.settings).toEqual(defaultFarmSettings);
    expect(res.body.displayPrefs).toEqual({ temperatureUnit: 'C', concentrationUnit: 'mg/L', ammoniaBasis: 'nh3' });
    expect(res.body.role).toBe('planner');
  });

  it('lets an admin create a farm, refuses a manager, and answers 409 for a slug in use', async () => {
    const s = slug();
    const created = await admin
      .post('/api/farms')
      .send({ slug: s, name: 'Test Farm', timeZone: 'Europe/Lisbon', settings: { silentAfterMissedIntervals: 3 } });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({
      slug: s,
      timeZone: 'Europe/Lisbon',
      role: 'admin',
      settings: { ...defaultFarmSettings, silentAfterMissedIntervals: 3 },
    });
    const byManager = await manager.post('/api/farms').send({ slug: slug(), name: 'Nope', timeZone: 'UTC' });
    expect(byManager.status).toBe(403);
    const dup = await admin.post('/api/farms').send({ slug: s, name: 'Again', timeZone: 'UTC' });
    expect(dup.status).toBe(409);
  });

  it('changes settings by merging them, validates the time zone, and audits the change', async () => {
    const created = await admin.post('/api/farms').send({ slug: slug(), name: 'Patch Farm', timeZone: 'America/Chicago' });
    const id = created.body.id as string;
    const bad = await admin.patch(`/api/farms/${id}`).send({ timeZone: 'Mars/Olympus_Mons' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fieldErrors.timeZone[0]).toMatch(/time zone/);
    const badSetting = await admin.patch(`/api/farms/${id}`).send({ settings: { dawnLocalTime: '25:00' } });
    expect(badSetting.status).toBe(400);

    await admin.patch(`/api/farms/${id}`).send({ settings: { probeWindowMinutes: 45 } });
    const res = await admin
      .patch(`/api/farms/${id}`)
      .send({ timeZone: 'America/Denver', settings: { escalationMinutes: 20 }, displayPrefs: { temperatureUnit: 'F' } });
    expect(res.status).toBe(200);
    expect(res.body.settings).toEqual({ ...defaultFarmSettings, probeWindowMinutes: 45, escalationMinutes: 20 });
    expect(res.body.displayPrefs.temperatureUnit).toBe('F');
    expect(await t.services.farms.getSettings(id)).toEqual(res.body.settings);

    const audit = await admin.get(`/api/farms/${id}/audit`).query({ entity: 'farm' });
    expect(audit.body.items[0]).toMatchObject({
      action: 'farm.updated',
      before: { timeZone: 'America/Chicago', settings: expect.objectContaining({ escalationMinutes: 15 }) },
      after: { timeZone: 'America/Denver', settings: expect.objectContaining({ escalationMinutes: 20 }) },
    });
  });

  it('refuses a hand who tries to change the farm (403)', async () => {
    const res = await hand.patch(`/api/farms/${farmId}`).send({ name: 'Hand Farm' });
    expect(res.status).toBe(403);
  });

  it('gives the farm-local day: 03:00 UTC is still yesterday in Chicago', async () => {
    expect(await t.services.farms.localDay(farmId, new Date('2026-03-10T03:00:00Z'))).toBe('2026-03-09');
    expect(await t.services.farms.localDay(farmId, new Date('2026-03-10T07:00:00Z'))).toBe('2026-03-10');
  });

  it('answers the farm map with the newest probe value per unit and quantity, and the installed unit status', async () => {
    const created = await admin.post('/api/farms').send({ slug: slug(), name: 'Map Farm', timeZone: 'America/Chicago' });
    const id = created.body.id as string;
    const pond = await admin.post(`/api/farms/${id}/units`).send({ code: 'P1', name: 'Pond', kind: 'pond' });
    await admin.post(`/api/farms/${id}/units`).send({ code: 'T1', name: 'Tank', kind: 'tank' });
    const a = await createProbe(t.ds, id, pond.body.id, ['ph', 'water_temperature']);
    const b = await createProbe(t.ds, id, pond.body.id, ['dissolved_oxygen', 'water_temperature']);
    const now = Date.now();
    const at = (minAgo: number) => new Date(now - minAgo * 60_000);
    await insertReadings(t.ds, [
      ...Array.from({ length: 120 }, (_, i) => ({ probeId: a.probeId, quantity: 'ph', at: at(120 - i), value: 7 + i / 100 })),
      { probeId: a.probeId, quantity: 'water_temperature', at: at(10), value: 24.1 },
      { probeId: b.probeId, quantity: 'water_temperature', at: at(2), value: 24.6, quality: 'suspect' },
      { probeId: b.probeId, quantity: 'dissolved_oxygen', at: at(5), value: 5.2 },
    ]);
    // Without a status provider (or one that knows nothing) the status is null.
    t.services.farms.useUnitStatusProvider(async () => new Map());
    const res = await admin.get(`/api/farms/${id}/status`);
    expect(res.status).toBe(200);
    expect(res.body.localDay).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    const byCode = Object.fromEntries(res.body.units.map((u: { code: string }) => [u.code, u]));
    expect(byCode.P1).toMatchObject({
      id: pond.body.id,
      kind: 'pond',
      state: 'active',
      status: null,
      latestResult: null,
      lastReadingAt: at(1).toISOString(),
      latest: {
        ph: { value: 8.19, unit: 'pH', at: at(1).toISOString(), quality: 'good', probeId: a.probeId },
        // Two probes report temperature: the newer reading wins, with its quality.
        water_temperature: { value: 24.6, unit: 'C', at: at(2).toISOString(), quality: 'suspect', probeId: b.probeId },
        dissolved_oxygen: { value: 5.2, unit: 'mg/L', at: at(5).toISOString(), quality: 'good', probeId: b.probeId },
      },
    });
    expect(byCode.T1).toMatchObject({ latest: {}, lastReadingAt: null, status: null });

    // The alerts module installs a status provider (server/container.ts); the map carries what it says.
    t.services.farms.useUnitStatusProvider(async (q) => new Map(q.units.map((u) => [u.id, u.lastReadingAt ? 'watch' : 'silent'])));
    const withStatus = await admin.get(`/api/farms/${id}/status`);
    const statuses = Object.fromEntries(withStatus.body.units.map((u: { code: string; status: string }) => [u.code, u.status]));
    expect(statuses).toEqual({ P1: 'watch', T1: 'silent' });
  });

  it('answers the farm map to every role on the farm and 404 to a stranger', async () => {
    for (const agent of [hand, planner, manager]) expect((await agent.get(`/api/farms/${farmId}/status`)).status).toBe(200);
    const stranger = await signedIn(t.app, demoEmail('manager', 'cedarflats'));
    expect((await stranger.get(`/api/farms/${farmId}/status`)).status).toBe(404);
  });
});
