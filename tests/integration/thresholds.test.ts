import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/test-app';
import { createTestFarm, type TestFarmOptions } from '../factories/test-farm';

let t: TestApp;

beforeAll(async () => {
  t = await startTestApp({ worker: true });
});
afterAll(() => t.close());

// --- a farm of the test's own: people, profiles (the seeded defaults), units, probes ---

const makeFarm = (tag: string, opts: TestFarmOptions = {}) => createTestFarm(t, tag, opts);


// Emerson et al. 1975 via UF/IFAS FA16 table: 24 °C, pH 8.2 → NH3-N fraction 0.0772 (published);
// NH3 = NH3-N × 1.21588 (computed from molar masses).
const NH3_PER_TAN = 0.0772 * 1.21588;

describe('threshold profiles', () => {
  it('lists every profile with its rules, bases, source labels and units, for any farm role', async () => {
    const f = await makeFarm('list');
    const hand = await f.person('hand', 'hand');
    const pond = await f.unit('P1');
    const res = await (await hand.agent()).get(`/api/farms/${f.farmId}/threshold-profiles`);
    expect(res.status).toBe(200);
    expect(res.body.caution).toMatch(/Thresholds are guidance/);
    expect(res.body.clearMargins.nh3).toEqual({ relative: 0.05, absolute: 0 });
    const catfish = res.body.profiles.find((p: { species: string }) => p.species === 'channel_catfish');
    expect(catfish.unitIds).toEqual([pond.id]);
    expect(catfish.rules.find((r: { metric: string }) => r.metric === 'do_min')).toMatchObject({ watch: 4, act: 2.5, basis: 'mg/L DO', source: expect.stringMatching(/UF\/IFAS FA27/) });
    const shrimp = res.body.profiles.find((p: { species: string }) => p.species === 'whiteleg_shrimp');
    expect(shrimp.rules.find((r: { metric: string }) => r.metric === 'nh3')).toMatchObject({ basis: 'mg/L NH3-N', bySalinity: [{ salinityPpt: 15, act: 0.12 }, { salinityPpt: 25, act: 0.16 }, { salinityPpt: 35, act: 0.16 }] });
  });

  it('lets a manager replace the rules (audited before and after) and refuses hands and contradictory limits', async () => {
    const f = await makeFarm('patch');
    const manager = await f.person('manager', 'manager');
    const hand = await f.person('hand', 'hand');
    const m = await manager.agent();
    const profile = (await m.get(`/api/farms/${f.farmId}/threshold-profiles`)).body.profiles.find((p: { species: string }) => p.species === 'rainbow_trout');
    const rules = profile.rules.map((r: { metric: string; act: number }) => (r.metric === 'do_min' ? { ...r, watch: 6.5 } : r));
    const url = `/api/farms/${f.farmId}/threshold-profiles/${profile.id}`;
    expect((await (await hand.agent()).patch(url).send({ rules })).status).toBe(403);
    const upside = await m.patch(url).send({ rules: [{ metric: 'nh3', watch: 0.05, act: 0.02, basis: 'mg/L NH3', source: 'test' }] });
    expect(upside.status).toBe(400);
    const wrongBasis = await m.patch(url).send({ rules: [{ metric: 'do_min', watch: 6, act: 5, basis: 'mg/L NH3', source: 'test' }] });
    expect(wrongBasis.status).toBe(400);
    const ok = await m.patch(url).send({ rules, reason: 'trout stressed below 6.5 on this spring' });
    expect(ok.status).toBe(200);
    expect(ok.body.rules.find((r: { metric: string }) => r.metric === 'do_min').watch).toBe(6.5);
    const audit = (await t.ds.query(`SELECT actor_id, before, after FROM audit_events WHERE entity = 'threshold_profile' AND entity_id = $1`, [profile.id])) as Array<{
      actor_id: string;
      before: { rules: Array<{ metric: string; watch: number }> };
      after: { rules: Array<{ metric: string; watch: number }>; reason: string };
    }>;
    expect(audit).toHaveLength(1);
    expect(audit[0]!.actor_id).toBe(manager.id);
    expect(audit[0]!.before.rules.find((r) => r.metric === 'do_min')?.watch).toBe(6);
    expect(audit[0]!.after.rules.find((r) => r.metric === 'do_min')?.watch).toBe(6.5);
    expect(audit[0]!.after.reason).toBe('trout stressed below 6.5 on this spring');
  });

  it('re-evaluates the units that use a profile when its limits move', async () => {
    const f = await makeFarm('move');
    const manager = await f.person('manager', 'manager');
    const hand = await f.person('hand', 'hand');
    const pond = await f.unit('P1');
    const res = await (await hand.agent())
      .post(`/api/farms/${f.farmId}/units/${pond.id}/tests`)
      .send({ clientId: randomUUID(), analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: 0.03 / NH3_PER_TAN, handheldPh: 8.2, handheldTemperatureC: 24 });
    expect(res.status).toBe(201);
    await t.drain();
    const m = await manager.agent();
    const list = async () => (await m.get(`/api/farms/${f.farmId}/alerts`).query({ unitId: pond.id, kind: 'nh3_high' })).body.alerts;
    expect((await list()).map((a: { level: string }) => a.level)).toEqual(['watch']);
    const profile = (await m.get(`/api/farms/${f.farmId}/threshold-profiles`)).body.profiles.find((p: { species: string }) => p.species === 'channel_catfish');
    const rules = profile.rules.map((r: { metric: string }) => (r.metric === 'nh3' ? { ...r, watch: 0.01, act: 0.025, source: 'farm veterinarian, 2026 (product test)' } : r));
    expect((await m.patch(`/api/farms/${f.farmId}/threshold-profiles/${profile.id}`).send({ rules })).status).toBe(200);
    await t.drain();
    const [a] = await list();
    expect(a).toMatchObject({ level: 'act', rule: { threshold: 0.025, source: 'farm veterinarian, 2026 (product test)' } });
  });
});
