import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CultureUnit, Farm, Membership, OnCallEntry, Probe, ThresholdProfile, User, type FarmSettings } from '../../server/db/entities';
import { thresholdProfiles } from '../../server/db/seed/harrow-bend';
import { AuthService } from '../../server/modules/auth/auth.service';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
const PASSWORD = 'dead-letter-test-passphrase';
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


describe('the dead-letter view of failed jobs', () => {
  it("shows a manager only their farm's failed jobs and retries only those", async () => {
    const mine = await makeFarm('dlq-mine');
    const theirs = await makeFarm('dlq-theirs');
    const manager = await mine.person('manager', 'manager');
    const hand = await mine.person('hand', 'hand');
    // Evaluations of units that do not exist fail (one attempt, so they land in the failed set at once).
    const ghost = randomUUID();
    await t.queues.add('evaluateUnit', { farmId: mine.farmId, unitId: ghost, reason: 'test' }, { jobId: `ghost-${ghost}`, attempts: 1 });
    await t.queues.add('evaluateUnit', { farmId: theirs.farmId, unitId: randomUUID(), reason: 'test' }, { jobId: `other-${ghost}`, attempts: 1 });
    await t.drain();
    const m = await manager.agent();
    const list = await m.get(`/api/farms/${mine.farmId}/jobs/failed`);
    expect(list.status).toBe(200);
    expect(list.body.jobs).toEqual([
      expect.objectContaining({ queue: 'evaluations', id: `ghost-${ghost}`, name: 'evaluate-unit', farmId: mine.farmId, attemptsMade: 1, attempts: 1, failedReason: 'Unit not found.' }),
    ]);
    expect((await (await hand.agent()).get(`/api/farms/${mine.farmId}/jobs/failed`)).status).toBe(403);

    const retry = await m.post(`/api/farms/${mine.farmId}/jobs/failed/retry`).send({ jobs: [{ queue: 'evaluations', id: `ghost-${ghost}` }, { queue: 'evaluations', id: `other-${ghost}` }] });
    expect(retry.status).toBe(200);
    expect(retry.body).toEqual({ retried: [{ queue: 'evaluations', id: `ghost-${ghost}` }], skipped: [{ queue: 'evaluations', id: `other-${ghost}` }] });
    await t.drain();
    const job = await t.queues.queue('evaluations').getJob(`ghost-${ghost}`);
    expect(await job?.getState()).toBe('failed');
    expect(job?.attemptsMade).toBe(2);
  });
});
