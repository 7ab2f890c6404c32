import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CultureUnit, Farm, Membership, OnCallEntry, Probe, ThresholdProfile, User, type FarmSettings } from '../../server/db/entities';
import { thresholdProfiles } from '../../server/db/seed/harrow-bend';
import { AuthService } from '../../server/modules/auth/auth.service';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
const PASSWORD = 'thresholds-test-passphrase';
let passwordHash = '';

beforeAll(async () => {
  t = await startTestApp({ worker: true });
  passwordHash = await AuthService.hashPassword(PASSWORD);
});
afterAll(() => t.close());

// --- a farm of the test's own: people, profiles (the seeded defaults), units, probes ---

async function makeFarm(tag: string, opts: { timeZone?: string; settings?: Partial<FarmSettings> } = {}) {
  const ds = t.ds;
  const id = randomUUID().slice(0, 8);
  const farm = await ds.getRepository(Farm).save(
    ds.getRepository(Farm).create({ slug: `${tag}-${id}`, name: `Test farm ${tag} ${id}`, timeZone: opts.timeZone ?? 'America/Chicago', settings: opts.settings ?? {}, displayPrefs: {} }),
  );
  const profiles = new Map<string, string>();
  for (const p of thresholdProfiles) {
    const saved = await ds.getRepository(ThresholdProfile).save(ds.getRepository(ThresholdProfile).create({ farmId: farm.id, name: p.name, species: p.species, lifeStage: null, rules: p.rules }));
    profiles.set(p.species, saved.id);
  }
  const person = async (role: 'hand' | 'manager' | 'planner', label: string) => {
    const email = `${label}-${id}@gillwise-tests.example`;
    const user = await ds.getRepository(User).save(ds.getRepository(User).create({ email, name: `${label} ${id}`, passwordHash, isAdmin: false, locale: 'en', prefs: {} }));
    await ds.getRepository(Membership).save(ds.getRepository(Membership).create({ farmId: farm.id, userId: user.id, role }));
    return { id: user.id, email, name: user.name, agent: () => signedIn(t.app, email, PASSWORD) };
  };
  const unit = async (code: string, o: { species?: string; kind?: CultureUnit['kind']; state?: CultureUnit['state']; waterType?: CultureUnit['waterType']; salinityPpt?: number } = {}) => {
    const species = o.species ?? 'channel_catfish';
    return ds.getRepository(CultureUnit).save(
      ds.getRepository(CultureUnit).create({
        farmId: farm.id,
        code,
        name: `${code} (${tag})`,
        kind: o.kind ?? 'pond',
        waterType: o.waterType ?? 'fresh',
        defaultSalinityPpt: o.salinityPpt ?? 0,
        species,
        lifeStage: null,
        state: o.state ?? 'active',
        testFrequencyDays: null,
        qrLabelId: `${tag}-${code}-${randomUUID()}`,
        walkOrder: 0,
        thresholdProfileId: profiles.get(species) ?? null,
        feedProteinFraction: 0.32,
        closeWatchUntil: null,
        outline: null,
        areaM2: 10_000,
        volumeM3: 12_000,
      }),
    );
  };
  const probe = async (unitId: string, quantities: string[], o: { intervalSeconds?: number; createdAt?: Date } = {}) => {
    const p = await ds.getRepository(Probe).save(
      ds.getRepository(Probe).create({
        farmId: farm.id,
        unitId,
        probeKey: `t-${randomUUID().slice(0, 12)}`,
        label: `sonde ${randomUUID().slice(0, 4)}`,
        model: null,
        quantities: quantities as Probe['quantities'],
        intervalSeconds: o.intervalSeconds ?? 60,
        secretHash: 'sha256:test',
        secretRotatedAt: new Date(),
        active: true,
      }),
    );
    if (o.createdAt) await ds.query('UPDATE probes SET created_at = $2 WHERE id = $1', [p.id, o.createdAt]);
    return p;
  };
  const onCall = async (entries: Array<{ userId: string; startsLocal?: string; endsLocal?: string }>) => {
    await ds.getRepository(OnCallEntry).insert(entries.map((e, i) => ({ farmId: farm.id, userId: e.userId, position: i + 1, startsLocal: e.startsLocal ?? '00:00', endsLocal: e.endsLocal ?? '24:00', weekdays: [1, 2, 3, 4, 5, 6, 7] })));
  };
  return { farm, farmId: farm.id, person, unit, probe, onCall };
}


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
