import { randomUUID } from 'node:crypto';
import { chmodSync, existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import type { DataSource, EntityManager } from 'typeorm';
import type { ProbeCredentialFile } from '../../../shared/schemas/mqtt.schema';
import { readingsTopic } from '../../../shared/mqtt/topics';
import {
  CultureUnit,
  Farm,
  FeedingTable,
  FlowMeasurement,
  Membership,
  Observation,
  OnCallEntry,
  Probe,
  ProbeCalibration,
  StockEvent,
  ThresholdProfile,
  Treatment,
  User,
  WaterTest,
} from '../entities';
import { AuthService } from '../../modules/auth/auth.service';
import { hashProbeSecret, newProbeSecret } from '../../modules/probes/probe-secrets';
import { rectangle } from './geometry';
import {
  CEDAR_FLATS,
  DEMO_PASSWORD,
  cedarFlatsUnits,
  demoUsers,
  feedingTables,
  harrowBendUnits,
  HARROW_BEND,
  thresholdProfiles,
  type DemoUnit,
} from './harrow-bend';

const HOUR = 3600_000;
const DAY = 24 * HOUR;

export type SeedResult = {
  created: boolean;
  farms: Record<string, string>;
  units: Record<string, string>;
  probes: ProbeCredentialFile['probes'];
  waterTestIds: string[];
};

export type SeedOptions = {
  brokerUrl: string;
  credentialsFile?: string;
  now?: Date;
  /** Stores simulated probe history (a few weeks) when given. */
  history?: (args: { manager: EntityManager; probes: Array<{ id: string; entry: ProbeCredentialFile['probes'][number] }>; now: Date }) => Promise<void>;
};

/** Seeds the invented demo farms. Idempotent: when Harrow Bend exists it only re-issues a missing credential file. */
export async function seedDemo(ds: DataSource, options: SeedOptions): Promise<SeedResult> {
  const now = options.now ?? new Date();
  const existing = await ds.getRepository(Farm).findOneBy({ slug: HARROW_BEND.slug });
  if (existing) {
    const probes = await reissueCredentialsIfMissing(ds, options);
    return { created: false, farms: { [HARROW_BEND.slug]: existing.id }, units: {}, probes, waterTestIds: [] };
  }
  const result = await ds.transaction(async (m) => {
    const passwordHash = await AuthService.hashPassword(DEMO_PASSWORD);
    const farms: Record<string, Farm> = {};
    for (const f of [HARROW_BEND, CEDAR_FLATS]) {
      farms[f.slug] = await m.save(
        m.create(Farm, { slug: f.slug, name: f.name, timeZone: f.timeZone, longitude: f.origin.lon, latitude: f.origin.lat, settings: {}, displayPrefs: {} }),
      );
    }
    const users: Record<string, User> = {};
    for (const u of demoUsers) {
      users[u.email] = await m.save(m.create(User, { email: u.email, name: u.name, passwordHash, isAdmin: u.isAdmin, locale: u.locale, prefs: {} }));
      if (u.farm && u.role) await m.save(m.create(Membership, { farmId: farms[u.farm]!.id, userId: users[u.email]!.id, role: u.role }));
    }
    const units: Record<string, CultureUnit> = {};
    const probes: Array<{ id: string; entry: ProbeCredentialFile['probes'][number] }> = [];
    for (const [farmDef, list] of [[HARROW_BEND, harrowBendUnits], [CEDAR_FLATS, cedarFlatsUnits]] as const) {
      const farm = farms[farmDef.slug]!;
      const profiles: Record<string, ThresholdProfile> = {};
      for (const p of thresholdProfiles) {
        profiles[p.species] = await m.save(m.create(ThresholdProfile, { farmId: farm.id, name: p.name, species: p.species, lifeStage: null, rules: p.rules }));
      }
      for (const t of feedingTables) {
        await m.save(m.create(FeedingTable, { farmId: farm.id, species: t.species, name: t.name, rows: t.rows, source: t.source, maxKgPerHaPerDay: t.maxKgPerHaPerDay ?? null }));
      }
      let walk = 0;
      for (const u of list) {
        const unit = await createUnit(m, farm, farmDef.origin, u, profiles[u.species]?.id ?? null, walk++, now);
        units[`${farmDef.slug}:${u.code}`] = unit;
        const secret = newProbeSecret();
        const probeKey = `${farmDef.slug === HARROW_BEND.slug ? 'hb' : 'cf'}-${u.code.toLowerCase()}-sonde`;
        const probe = await m.save(
          m.create(Probe, {
            farmId: farm.id,
            unitId: unit.id,
            probeKey,
            label: `${u.code} sonde`,
            model: 'multi-parameter sonde (demo)',
            quantities: u.probe.quantities,
            intervalSeconds: 60,
            secretHash: hashProbeSecret(secret),
            secretRotatedAt: now,
            active: true,
          }),
        );
        probes.push({
          id: probe.id,
          entry: {
            probeKey,
            secret,
            farmSlug: farmDef.slug,
            unitCode: u.code,
            unitKind: u.kind,
            waterType: u.waterType,
            salinityPpt: u.salinityPpt,
            species: u.species,
            quantities: u.probe.quantities,
            intervalSeconds: 60,
            // The flow cut happened about a day and a half ago; history and the live simulator agree on when.
            scenario: u.probe.scenario === 'flow-cut' ? `flow-cut:at=${new Date(now.getTime() - 32 * HOUR).toISOString()},fraction=0.15` : u.probe.scenario,
            ...(u.probe.temperatureUnit ? { temperatureUnit: u.probe.temperatureUnit } : {}),
            farmTimeZone: farmDef.timeZone,
            latitude: farmDef.origin.lat,
            longitude: farmDef.origin.lon,
            depthM: u.depthM,
            ...(u.designFlowLpm ? { designFlowLpm: u.designFlowLpm } : {}),
          },
        });
        // pH calibrations: one recent, one overdue (R2's pH electrode is due for calibration).
        const calibratedDaysAgo = u.code === 'R2' ? 40 : 9;
        await m.save(
          m.create(ProbeCalibration, {
            probeId: probe.id,
            quantity: 'ph',
            performedAt: new Date(now.getTime() - calibratedDaysAgo * DAY),
            performedById: users['manager@harrowbend.example']?.id ?? null,
            method: 'two-buffer (7.00, 4.01) + check buffer 10.01',
            details: { mV7: -5.0, mV4: 168.0, slopePct: 97.8, checkBuffer: 10.01, checkRead: 10.05 },
            passed: true,
            nextDueAt: new Date(now.getTime() + (30 - calibratedDaysAgo) * DAY),
            note: null,
          }),
        );
      }
    }
    const hb = farms[HARROW_BEND.slug]!;
    const waterTestIds = await seedKitHistory(m, hb, units, users, now);
    const manager = users['manager@harrowbend.example']!;
    const admin = users['admin@harrowbend.example']!;
    await m.save([
      m.create(OnCallEntry, { farmId: hb.id, userId: manager.id, position: 1, startsLocal: '00:00', endsLocal: '24:00', weekdays: [1, 2, 3, 4, 5, 6, 7] }),
      m.create(OnCallEntry, { farmId: hb.id, userId: admin.id, position: 2, startsLocal: '00:00', endsLocal: '24:00', weekdays: [1, 2, 3, 4, 5, 6, 7] }),
      m.create(OnCallEntry, { farmId: farms[CEDAR_FLATS.slug]!.id, userId: users['manager@cedarflats.example']!.id, position: 1, startsLocal: '00:00', endsLocal: '24:00', weekdays: [1, 2, 3, 4, 5, 6, 7] }),
    ]);
    if (options.history) await options.history({ manager: m, probes, now });
    return {
      created: true,
      farms: Object.fromEntries(Object.entries(farms).map(([k, v]) => [k, v.id])),
      units: Object.fromEntries(Object.entries(units).map(([k, v]) => [k, v.id])),
      probes: probes.map((p) => p.entry),
      waterTestIds,
    };
  });
  if (options.credentialsFile) writeCredentials(options.credentialsFile, options.brokerUrl, result.probes);
  return result;
}

async function createUnit(
  m: EntityManager,
  farm: Farm,
  origin: { lon: number; lat: number },
  u: DemoUnit,
  profileId: string | null,
  walkOrder: number,
  now: Date,
): Promise<CultureUnit> {
  const [east, north, width, length] = u.at;
  const areaM2 = width * length;
  const unit = await m.save(
    m.create(CultureUnit, {
      farmId: farm.id,
      code: u.code,
      name: u.name,
      kind: u.kind,
      outline: rectangle(origin, east, north, width, length),
      areaM2,
      volumeM3: Math.round(areaM2 * u.depthM),
      waterType: u.waterType,
      defaultSalinityPpt: u.salinityPpt,
      species: u.species,
      lifeStage: u.lifeStage,
      state: u.state,
      testFrequencyDays: null,
      qrLabelId: `${farm.slug}-${u.code.toLowerCase()}-${randomUUID().slice(0, 8)}`,
      walkOrder,
      thresholdProfileId: profileId,
      feedProteinFraction: u.protein,
      closeWatchUntil: null,
    }),
  );
  if (u.designFlowLpm) {
    await m.save(m.create(FlowMeasurement, { farmId: farm.id, unitId: unit.id, measuredAt: new Date(now.getTime() - 60 * DAY), flowLpm: u.designFlowLpm, source: 'design', note: 'design flow' }));
  }
  // Stocking, then weekly sample weighings with growth, and a few mortalities.
  const stockedAt = new Date(now.getTime() - u.stock.daysAgo * DAY);
  const startWeight = u.stock.meanWeightG / Math.pow(1.012, u.stock.daysAgo);
  await m.save(
    m.create(StockEvent, {
      farmId: farm.id,
      unitId: unit.id,
      kind: 'stocking',
      at: stockedAt,
      count: u.stock.count,
      meanWeightG: round(startWeight, 1),
      totalWeightKg: round((u.stock.count * startWeight) / 1000, 1),
      meanLengthCm: u.stock.meanLengthCm ? round(u.stock.meanLengthCm * 0.7, 1) : null,
      note: 'stocked (demo)',
    }),
  );
  for (let d = u.stock.daysAgo - 7; d > 0; d -= 7) {
    const mean = startWeight * Math.pow(1.012, u.stock.daysAgo - d);
    await m.save(
      m.create(StockEvent, {
        farmId: farm.id,
        unitId: unit.id,
        kind: 'sample_weighing',
        at: new Date(now.getTime() - d * DAY),
        sampleSize: 50,
        meanWeightG: round(mean, 1),
        sampleSdG: round(mean * 0.18, 1),
        meanLengthCm: u.stock.meanLengthCm ? round(u.stock.meanLengthCm * (0.7 + (0.3 * (u.stock.daysAgo - d)) / u.stock.daysAgo), 1) : null,
      }),
    );
    if (d % 14 === 0 || d < 10) {
      await m.save(m.create(StockEvent, { farmId: farm.id, unitId: unit.id, kind: 'mortality', at: new Date(now.getTime() - d * DAY + 5 * HOUR), count: Math.max(1, Math.round(u.stock.count * 0.0015)), note: 'daily pick-up' }));
    }
  }
  return unit;
}

/** Kit results for a few weeks: the cycling pond daily, the rest weekly; the formalin + Nessler case; R3's climb. */
async function seedKitHistory(m: EntityManager, farm: Farm, units: Record<string, CultureUnit>, users: Record<string, User>, now: Date): Promise<string[]> {
  const hand = users['hand@harrowbend.example']!;
  const ids: string[] = [];
  const unit = (code: string) => units[`${HARROW_BEND.slug}:${code}`]!;
  const test = async (code: string, hoursAgo: number, analyte: string, method: string, basis: string, value: number, unitLabel = 'mg/L', note: string | null = null) => {
    const row = await m.save(
      m.create(WaterTest, {
        farmId: farm.id,
        unitId: unit(code).id,
        clientId: randomUUID(),
        analyte,
        method,
        basis,
        value,
        unit: unitLabel,
        sampledAt: new Date(now.getTime() - hoursAgo * HOUR),
        handheldPh: null,
        handheldTemperatureC: null,
        handheldSalinityPpt: null,
        note,
        source: 'pondside',
        enteredById: hand.id,
        version: 1,
      }),
    );
    ids.push(row.id);
  };
  // Established units: a weekly salicylate TAN test, mid-morning.
  const weekly: Array<[string, number[]]> = [
    ['P1', [0.6, 0.8, 0.9]], ['P3', [0.7, 0.6, 1.1]], ['P4', [0.9, 1.0, 1.2]], ['P6', [0.8, 0.7, 0.9]],
    ['R1', [0.35, 0.3, 0.4]], ['R2', [0.3, 0.35, 0.32]], ['R4', [0.25, 0.3, 0.28]], ['S1', [0.5, 0.6, 0.7]], ['S2', [0.4, 0.5, 0.6]],
  ];
  for (const [code, values] of weekly) {
    for (const [i, v] of values.entries()) await test(code, (3 - i) * 7 * 24 - 2 - i, 'total_ammonia', 'salicylate', 'tan-n', v);
  }
  // P5 is cycling: daily TAN rising then falling as the biofilter establishes; nitrite follows.
  const cycleTan = [0.4, 0.8, 1.3, 1.9, 2.6, 3.1, 2.9, 2.4, 1.8, 1.2];
  for (const [i, v] of cycleTan.entries()) {
    const daysAgo = cycleTan.length - i;
    await test('P5', daysAgo * 24 - 3, 'total_ammonia', 'salicylate', 'tan-n', v);
    if (i >= 4) await test('P5', daysAgo * 24 - 3, 'nitrite', 'colorimetric', 'no2-n', round(0.2 + (i - 4) * 0.35, 2));
  }
  await test('P5', 24 * 4 - 3, 'chloride', 'titration', 'cl', 45);
  // P2: formalin bath three days ago, then a Nessler TAN test two days after it (may read high).
  await m.save(
    m.create(Treatment, {
      farmId: farm.id,
      unitId: unit('P2').id,
      product: 'formalin',
      productName: 'Formalin 37 % (demo)',
      dose: 25,
      doseUnit: 'mg/L',
      startsAt: new Date(now.getTime() - 3 * DAY),
      endsAt: new Date(now.getTime() - 3 * DAY + 6 * HOUR),
      withdrawalDays: null,
      withdrawalDegreeDays: null,
      withdrawalEndsAt: null,
      note: 'pond bath against external parasites (demo)',
      createdById: users['manager@harrowbend.example']!.id,
    }),
  );
  await test('P2', 21 * 24 + 4, 'total_ammonia', 'salicylate', 'tan-n', 0.7);
  await test('P2', 14 * 24 + 4, 'total_ammonia', 'salicylate', 'tan-n', 0.8);
  await test('P2', 24 + 2, 'total_ammonia', 'nessler', 'tan-n', 1.9, 'mg/L', 'Nessler kit, two days after the formalin bath');
  // R3: flow cut about a day and a half ago; TAN climbs at the outlet.
  await test('R3', 14 * 24 + 2, 'total_ammonia', 'salicylate', 'tan-n', 0.3);
  await test('R3', 7 * 24 + 2, 'total_ammonia', 'salicylate', 'tan-n', 0.35);
  await test('R3', 30, 'total_ammonia', 'salicylate', 'tan-n', 0.6);
  await test('R3', 18, 'total_ammonia', 'salicylate', 'tan-n', 1.1);
  await test('R3', 4, 'total_ammonia', 'salicylate', 'tan-n', 1.7);
  await m.save(m.create(Observation, { farmId: farm.id, unitId: unit('R3').id, kind: 'off_feed', detail: 'fish slow to take feed at the tail end (demo)', count: null, observedAt: new Date(now.getTime() - 20 * HOUR), createdById: hand.id }));
  await m.save(m.create(Observation, { farmId: farm.id, unitId: unit('P4').id, kind: 'water_colour', detail: 'deep green bloom (demo)', count: null, observedAt: new Date(now.getTime() - 2 * DAY), createdById: hand.id }));
  return ids;
}

async function reissueCredentialsIfMissing(ds: DataSource, options: SeedOptions): Promise<ProbeCredentialFile['probes']> {
  if (!options.credentialsFile || existsSync(options.credentialsFile)) return [];
  // The file holds the only copy of each secret: when it is gone, rotate the demo probes' secrets.
  const rows: Array<{ probe: Probe; unit: CultureUnit; farm: Farm }> = [];
  for (const probe of await ds.getRepository(Probe).find()) {
    const unit = probe.unitId ? await ds.getRepository(CultureUnit).findOneBy({ id: probe.unitId }) : null;
    const farm = await ds.getRepository(Farm).findOneBy({ id: probe.farmId });
    if (unit && farm) rows.push({ probe, unit, farm });
  }
  const all = [...harrowBendUnits, ...cedarFlatsUnits];
  const entries: ProbeCredentialFile['probes'] = [];
  for (const { probe, unit, farm } of rows) {
    const secret = newProbeSecret();
    await ds.getRepository(Probe).update({ id: probe.id }, { secretHash: hashProbeSecret(secret), secretRotatedAt: new Date() });
    const demo = all.find((u) => u.code === unit.code);
    const farmDef = [HARROW_BEND, CEDAR_FLATS].find((f) => f.slug === farm.slug);
    entries.push({
      ...(farmDef ? { farmTimeZone: farmDef.timeZone, latitude: farmDef.origin.lat, longitude: farmDef.origin.lon } : {}),
      ...(demo ? { depthM: demo.depthM, ...(demo.designFlowLpm ? { designFlowLpm: demo.designFlowLpm } : {}), ...(demo.probe.temperatureUnit ? { temperatureUnit: demo.probe.temperatureUnit } : {}) } : {}),
      probeKey: probe.probeKey,
      secret,
      farmSlug: farm.slug,
      unitCode: unit.code,
      unitKind: unit.kind,
      waterType: unit.waterType,
      salinityPpt: unit.defaultSalinityPpt,
      species: unit.species ?? 'unknown',
      quantities: probe.quantities,
      intervalSeconds: probe.intervalSeconds,
      scenario: demo?.probe.scenario ?? 'steady',
    });
  }
  writeCredentials(options.credentialsFile, options.brokerUrl, entries);
  return entries;
}

export function writeCredentials(file: string, brokerUrl: string, probes: ProbeCredentialFile['probes']): void {
  mkdirSync(dirname(file), { recursive: true });
  const body: ProbeCredentialFile = { brokerUrl, probes };
  writeFileSync(file, `${JSON.stringify(body, null, 2)}\n`, { mode: 0o600 });
  chmodSync(file, 0o600);
}

export const topicFor = readingsTopic;
const round = (v: number, d: number) => Math.round(v * 10 ** d) / 10 ** d;
