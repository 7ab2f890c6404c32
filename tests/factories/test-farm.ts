// A farm of a test's own: people (signed in with one password), the seeded threshold profiles, units, probes,
// an on-call list. Tests that must not share the demo farm's state build one of these each.
import { randomUUID } from 'node:crypto';
import { CultureUnit, Farm, Membership, OnCallEntry, Probe, ThresholdProfile, User, type FarmSettings } from '../../server/db/entities';
import { thresholdProfiles } from '../../server/db/seed/harrow-bend';
import { AuthService } from '../../server/modules/auth/auth.service';
import type { TestApp } from '../setup/test-app';
import { signedIn } from './session';

export const TEST_FARM_PASSWORD = 'test-farm-passphrase';
export type TestFarmOptions = { timeZone?: string; settings?: Partial<FarmSettings> };
let passwordHash = '';

export async function createTestFarm(t: TestApp, tag: string, opts: TestFarmOptions = {}) {
  const ds = t.ds;
  passwordHash ||= await AuthService.hashPassword(TEST_FARM_PASSWORD);
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
    return { id: user.id, email, name: user.name, agent: () => signedIn(t.app, email, TEST_FARM_PASSWORD) };
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

export type TestFarm = Awaited<ReturnType<typeof createTestFarm>>;
