import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SeedResult } from '../../server/db/seed/seed';
import { rectangle } from '../../server/db/seed/geometry';
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

const origin = { lon: -91.02875, lat: 33.26431 };
const code = () => `U${randomUUID().slice(0, 6).toUpperCase()}`;

beforeAll(async () => {
  t = await startTestApp();
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  otherFarmId = seed.farms['cedar-flats']!;
  manager = await signedIn(t.app, demoEmail('manager'));
  hand = await signedIn(t.app, demoEmail('hand'));
  otherManager = await signedIn(t.app, demoEmail('manager', 'cedarflats'));
});
afterAll(() => t.close());

async function createUnit(body: Record<string, unknown> = {}) {
  const res = await manager
    .post(`/api/farms/${farmId}/units`)
    .send({ code: code(), name: 'Test pond', kind: 'pond', outline: rectangle(origin, 900, 900, 140, 110), ...body });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as { id: string; code: string; areaM2: number; qrLabelId: string; [k: string]: unknown };
}

describe('units', () => {
  it('creates a unit, computes its area from the outline and gives it a QR label id', async () => {
    const unit = await createUnit({ species: 'channel_catfish', lifeStage: 'food_fish', volumeM3: 18_000, state: 'cycling' });
    // 140 m × 110 m on the ground = 15 400 m²; the spherical area agrees to well under 0.5 %.
    expect(Math.abs(unit.areaM2 - 15_400) / 15_400).toBeLessThan(0.005);
    expect(unit.qrLabelId).toMatch(/^[A-Za-z0-9_-]{8,}$/);
    expect(unit).toMatchObject({
      kind: 'pond',
      state: 'cycling',
      waterType: 'fresh',
      defaultSalinityPpt: 0,
      feedProteinFraction: 0.32,
      volumeM3: 18_000,
    });
    const got = await hand.get(`/api/farms/${farmId}/units/${unit.id}`);
    expect(got.status).toBe(200);
    expect(got.body).toEqual(unit);
  });

  it('keeps an area given explicitly and allows a unit without an outline', async () => {
    const tank = await createUnit({ kind: 'tank', outline: null, areaM2: 12.5 });
    expect(tank.areaM2).toBe(12.5);
    expect(tank.outline).toBeNull();
  });

  it('answers 400 with field errors for an open ring, too few positions and coordinates out of range', async () => {
    const ring = rectangle(origin, 0, 0, 10, 10).coordinates[0]!;
    const cases: Array<[unknown, RegExp]> = [
      [{ type: 'Polygon', coordinates: [ring.slice(0, 4)] }, /not closed/],
      [{ type: 'Polygon', coordinates: [[ring[0], ring[1], ring[0]]] }, /at least 4/],
      [
        {
          type: 'Polygon',
          coordinates: [
            [
              [200, 33],
              [200.001, 33],
              [200.001, 33.001],
              [200, 33],
            ],
          ],
        },
        /longitude 200/,
      ],
      [
        {
          type: 'Polygon',
          coordinates: [
            [
              [-91, 95],
              [-91.001, 95],
              [-91.001, 95.001],
              [-91, 95],
            ],
          ],
        },
        /latitude 95/,
      ],
      [{ type: 'Point', coordinates: [-91, 33] }, /.+/],
    ];
    for (const [outline, message] of cases) {
      const res = await manager.post(`/api/farms/${farmId}/units`).send({ code: code(), name: 'Bad outline', kind: 'pond', outline });
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
      expect(res.body.error.details.fieldErrors.outline.join(' ')).toMatch(message);
    }
    const missing = await manager.post(`/api/farms/${farmId}/units`).send({ kind: 'lagoon' });
    expect(missing.status).toBe(400);
    expect(Object.keys(missing.body.error.details.fieldErrors).sort()).toEqual(['code', 'kind', 'name']);
  });

  it('answers 409 for a code the farm already uses', async () => {
    const unit = await createUnit();
    const again = await manager.post(`/api/farms/${farmId}/units`).send({ code: unit.code, name: 'Twin', kind: 'pond' });
    expect(again.status).toBe(409);
    expect(again.body.error.details.fieldErrors.code).toBeDefined();
  });

  it('changes only the fields sent, recomputes the area with a new outline, and audits before and after', async () => {
    const unit = await createUnit();
    const res = await manager
      .patch(`/api/farms/${farmId}/units/${unit.id}`)
      .send({ state: 'fallow', outline: rectangle(origin, 900, 900, 100, 100), testFrequencyDays: 3 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ state: 'fallow', testFrequencyDays: 3, code: unit.code, name: 'Test pond' });
    expect(Math.abs(res.body.areaM2 - 10_000) / 10_000).toBeLessThan(0.005);

    const audit = await manager.get(`/api/farms/${farmId}/audit`).query({ entity: 'unit', entityId: unit.id });
    expect(audit.status).toBe(200);
    const [updated, created] = audit.body.items;
    expect(updated).toMatchObject({
      action: 'unit.updated',
      actor: { email: demoEmail('manager') },
      before: { state: 'active', testFrequencyDays: null },
      after: { state: 'fallow', testFrequencyDays: 3 },
    });
    expect(updated.before.areaM2).toBeCloseTo(unit.areaM2, 1);
    expect(updated.after).not.toHaveProperty('name');
    expect(created).toMatchObject({ action: 'unit.created', before: null, after: { id: unit.id, code: unit.code } });
  });

  it('refuses a hand who tries to create or change a unit (403) but lets the hand read them', async () => {
    const create = await hand.post(`/api/farms/${farmId}/units`).send({ code: code(), name: 'Not mine', kind: 'pond' });
    expect(create.status).toBe(403);
    const unit = await createUnit();
    const patch = await hand.patch(`/api/farms/${farmId}/units/${unit.id}`).send({ name: 'Renamed' });
    expect(patch.status).toBe(403);
    const list = await hand.get(`/api/farms/${farmId}/units`);
    expect(list.status).toBe(200);
    expect(list.body.units.map((u: { id: string }) => u.id)).toContain(unit.id);
  });

  it("answers 404 for another farm's unit, whichever farm it is asked under", async () => {
    const unit = await createUnit();
    const underOwnFarm = await otherManager.get(`/api/farms/${otherFarmId}/units/${unit.id}`);
    expect(underOwnFarm.status).toBe(404);
    const underTheirFarm = await otherManager.get(`/api/farms/${farmId}/units/${unit.id}`);
    expect(underTheirFarm.status).toBe(404);
    const patch = await otherManager.patch(`/api/farms/${otherFarmId}/units/${unit.id}`).send({ name: 'Hijacked' });
    expect(patch.status).toBe(404);
  });

  it('refuses a threshold profile of another farm', async () => {
    const [other] = (await t.ds.query('SELECT id FROM threshold_profiles WHERE farm_id = $1 LIMIT 1', [otherFarmId])) as Array<{
      id: string;
    }>;
    const res = await manager
      .post(`/api/farms/${farmId}/units`)
      .send({ code: code(), name: 'P', kind: 'pond', thresholdProfileId: other!.id });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fieldErrors.thresholdProfileId).toBeDefined();
  });

  it('resolves a scanned QR label to its unit, and serves the label as SVG encoding the test URL', async () => {
    const unit = await createUnit();
    const label = await hand.get(`/api/farms/${farmId}/units/${unit.id}/label`);
    expect(label.status).toBe(200);
    expect(label.body.url).toBe(`${t.config.PUBLIC_URL.replace(/\/$/, '')}/farms/${farmId}/units/${unit.id}/test?label=${unit.qrLabelId}`);
    expect(label.body.svg).toMatch(/^<svg[\s\S]*<\/svg>\s*$/);

    const resolved = await hand.get(`/api/farms/${farmId}/labels/${unit.qrLabelId}`);
    expect(resolved.status).toBe(200);
    expect(resolved.body).toEqual({
      farmId,
      unitId: unit.id,
      code: unit.code,
      name: 'Test pond',
      kind: 'pond',
      testPath: `/farms/${farmId}/units/${unit.id}/test`,
    });

    const otherFarm = await otherManager.get(`/api/farms/${otherFarmId}/labels/${unit.qrLabelId}`);
    expect(otherFarm.status).toBe(404);
    const unknown = await hand.get(`/api/farms/${farmId}/labels/no-such-label`);
    expect(unknown.status).toBe(404);
  });

  it('keeps a flow history and answers the newest of probe and hand measurements as the current flow', async () => {
    const raceway = await createUnit({ kind: 'raceway', outline: rectangle(origin, 950, 950, 3, 30) });
    const base = `/api/farms/${farmId}/units/${raceway.id}/flows`;
    const design = await manager
      .post(base)
      .send({ flowLpm: 2600, source: 'design', measuredAt: new Date(Date.now() - 10 * 86_400_000).toISOString() });
    expect(design.status).toBe(201);
    const handDesign = await hand.post(base).send({ flowLpm: 1, source: 'design' });
    expect(handDesign.status).toBe(403);

    // The probe read 2500 L/min an hour ago: newer than the design flow, so it counts.
    const probe = await createProbe(t.ds, farmId, raceway.id, ['flow']);
    await insertReadings(t.ds, [{ probeId: probe.probeId, quantity: 'flow', at: new Date(Date.now() - 3600_000), value: 2500 }]);
    let list = await hand.get(base);
    expect(list.body.latest).toMatchObject({ flowLpm: 2500, source: 'probe', probeId: probe.probeId });

    // Then a hand measures 900 L/min (a blocked screen): the newest wins.
    const manual = await hand.post(base).send({ flowLpm: 900, note: 'screen half blocked' });
    expect(manual.status).toBe(201);
    list = await hand.get(base);
    expect(list.body.latest).toMatchObject({ flowLpm: 900, source: 'manual', measurementId: manual.body.id });
    expect(list.body.items.map((f: { flowLpm: number }) => f.flowLpm)).toEqual([900, 2600]);
    expect((await t.services.units.latestFlowLpm(raceway.id))?.flowLpm).toBe(900);

    const audit = await manager.get(`/api/farms/${farmId}/audit`).query({ entityId: raceway.id });
    expect(audit.body.items.filter((e: { action: string }) => e.action === 'unit.flow_recorded')).toHaveLength(2);
  });
});
