import { randomUUID } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isValidProbeKey, readingsTopic } from '../../shared/mqtt/topics';
import { probeCredentialFileSchema } from '../../shared/schemas/mqtt.schema';
import type { ProbeFinding, ProbeHealth } from '../../shared/schemas/probes.schema';
import type { SeedResult } from '../../server/db/seed/seed';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { insertReadings } from '../factories/readings';
import { signedIn } from '../factories/session';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
let otherFarmId: string;
let credDir: string;
let credFile: string;
type Agent = Awaited<ReturnType<typeof signedIn>>;
let manager: Agent;
let hand: Agent;
let planner: Agent;
let otherManager: Agent;
const clients: MqttClient[] = [];

const MIN = 60_000;

beforeAll(async () => {
  credDir = mkdtempSync(join(tmpdir(), 'gw-probes-'));
  credFile = join(credDir, 'probe-credentials.json');
  t = await startTestApp({ broker: true, env: { INGEST_FLUSH_MS: '10', PROBE_CREDENTIALS_FILE: credFile } });
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  otherFarmId = seed.farms['cedar-flats']!;
  [manager, hand, planner, otherManager] = await Promise.all([
    signedIn(t.app, demoEmail('manager')),
    signedIn(t.app, demoEmail('hand')),
    signedIn(t.app, demoEmail('planner')),
    signedIn(t.app, demoEmail('manager', 'cedarflats')),
  ]);
});
afterAll(async () => {
  await Promise.all(clients.map((c) => c.endAsync(true).catch(() => undefined)));
  await t.close();
  rmSync(credDir, { recursive: true, force: true });
});

const brokerUrl = () => `mqtt://127.0.0.1:${t.broker!.port}`;
async function connect(username: string, password: string): Promise<MqttClient> {
  const c = await mqtt.connectAsync(brokerUrl(), {
    protocolVersion: 4,
    username,
    password,
    clientId: `${username}-${randomUUID().slice(0, 6)}`,
    reconnectPeriod: 0,
  });
  clients.push(c);
  return c;
}
/** The CONNACK refusal of a connection attempt, or null if it was accepted. */
async function refusal(username: string, password: string): Promise<string | null> {
  try {
    const c = await connect(username, password);
    await c.endAsync(true);
    return null;
  } catch (err) {
    return err instanceof Error ? err.message : String(err);
  }
}
const onePh = (value: number, at = new Date()) =>
  JSON.stringify({ v: 1, samples: [{ at: at.toISOString(), values: [{ quantity: 'ph', value, unit: 'pH' }] }] });

async function newUnit(kind: 'pond' | 'raceway' = 'pond') {
  const res = await manager
    .post(`/api/farms/${farmId}/units`)
    .send({ code: `Q${randomUUID().slice(0, 6)}`, name: 'Probe test unit', kind });
  expect(res.status).toBe(201);
  return res.body.id as string;
}
async function newProbe(body: Record<string, unknown> = {}) {
  const unitId = await newUnit();
  const res = await manager
    .post(`/api/farms/${farmId}/probes`)
    .send({ label: 'Test sonde', unitId, quantities: ['ph', 'water_temperature', 'dissolved_oxygen'], intervalSeconds: 60, ...body });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return {
    unitId,
    ...(res.body as {
      probe: { id: string; probeKey: string; health: ProbeHealth };
      credential: { username: string; secret: string; topic: string };
    }),
  };
}
async function healthOf(probeId: string, now?: Date): Promise<ProbeHealth> {
  const all = await t.services.probeHealth.evaluate(farmId, now);
  const h = all.find((p) => p.probeId === probeId);
  if (!h) throw new Error('probe not evaluated');
  return h;
}
const kinds = (h: ProbeHealth) => h.findings.map((f) => f.kind).sort();
const finding = <K extends ProbeFinding['kind']>(h: ProbeHealth, kind: K) =>
  h.findings.find((f) => f.kind === kind) as Extract<ProbeFinding, { kind: K }> | undefined;

describe('probe registration and credentials', () => {
  it('shows the secret once at creation, and a real MQTT client can connect and publish with it', async () => {
    const { probe, credential } = await newProbe();
    expect(isValidProbeKey(probe.probeKey)).toBe(true);
    expect(probe.probeKey).toMatch(/^hb-[a-z0-9]{8}$/);
    expect(credential).toMatchObject({ username: probe.probeKey, topic: readingsTopic(probe.probeKey) });
    expect(credential.secret.length).toBeGreaterThanOrEqual(32);

    const again = await manager.get(`/api/farms/${farmId}/probes/${probe.id}`);
    expect(again.status).toBe(200);
    expect(JSON.stringify(again.body)).not.toContain(credential.secret);
    expect(again.body).not.toHaveProperty('secretHash');
    const list = await hand.get(`/api/farms/${farmId}/probes`);
    expect(JSON.stringify(list.body)).not.toContain(credential.secret);

    const client = await connect(credential.username, credential.secret);
    await client.publishAsync(credential.topic, onePh(7.4), { qos: 1 });
    const rows = (await t.ds.query('SELECT value FROM readings WHERE probe_id = $1', [probe.id])) as Array<{ value: number }>;
    expect(rows).toEqual([{ value: 7.4 }]);
  });

  it('rotating the credential refuses the old secret at once and accepts the new one', async () => {
    const { probe, credential } = await newProbe();
    const live = await connect(credential.username, credential.secret);
    const closed = new Promise<void>((resolve) => live.once('close', () => resolve()));

    const rotated = await manager.post(`/api/farms/${farmId}/probes/${probe.id}/credential`);
    expect(rotated.status).toBe(200);
    expect(rotated.headers['cache-control']).toBe('no-store');
    const fresh = rotated.body.credential.secret as string;
    expect(fresh).not.toBe(credential.secret);

    await closed; // the live connection with the old secret was closed
    expect(await refusal(credential.username, credential.secret)).toMatch(/Bad username or password/i);
    const client = await connect(credential.username, fresh);
    await client.publishAsync(credential.topic, onePh(7.1), { qos: 1 });
    const rows = (await t.ds.query('SELECT count(*)::int AS n FROM readings WHERE probe_id = $1', [probe.id])) as Array<{ n: number }>;
    expect(rows[0]!.n).toBe(1);

    const audit = await manager.get(`/api/farms/${farmId}/audit`).query({ entity: 'probe', entityId: probe.id });
    expect(audit.body.items.map((e: { action: string }) => e.action)).toEqual(['probe.credential_rotated', 'probe.created']);
    expect(JSON.stringify(audit.body)).not.toContain(fresh);
  });

  it('keeps the simulator credential file (mode 600) in step with creation, rotation and deactivation', async () => {
    const { probe, credential, unitId } = await newProbe();
    const read = () => probeCredentialFileSchema.parse(JSON.parse(readFileSync(credFile, 'utf8')));
    expect(statSync(credFile).mode & 0o777).toBe(0o600);
    const entry = () => read().probes.find((p) => p.probeKey === probe.probeKey);
    expect(entry()).toMatchObject({
      secret: credential.secret,
      farmSlug: 'harrow-bend',
      unitKind: 'pond',
      scenario: 'steady',
      quantities: ['ph', 'water_temperature', 'dissolved_oxygen'],
    });
    const unit = await manager.get(`/api/farms/${farmId}/units/${unitId}`);
    expect(entry()?.unitCode).toBe(unit.body.code);

    expect(entry()).toMatchObject({ farmTimeZone: 'America/Chicago', latitude: expect.any(Number), longitude: expect.any(Number) });

    // Someone gave the probe a simulator scenario in the file: rotation keeps it.
    const file = JSON.parse(readFileSync(credFile, 'utf8')) as { probes: Array<{ probeKey: string; scenario: string }> };
    file.probes.find((p) => p.probeKey === probe.probeKey)!.scenario = 'drift';
    writeFileSync(credFile, JSON.stringify(file), { mode: 0o600 });
    const rotated = await manager.post(`/api/farms/${farmId}/probes/${probe.id}/credential`);
    expect(entry()).toMatchObject({ secret: rotated.body.credential.secret, scenario: 'drift' });
    expect(statSync(credFile).mode & 0o777).toBe(0o600);
    const off = await manager.post(`/api/farms/${farmId}/probes/${probe.id}/deactivate`);
    expect(off.status).toBe(200);
    expect(entry()).toBeUndefined();
  });

  it('refuses a deactivated probe at the broker', async () => {
    const { probe, credential } = await newProbe();
    const off = await manager.post(`/api/farms/${farmId}/probes/${probe.id}/deactivate`);
    expect(off.body).toMatchObject({ active: false, health: { state: 'inactive', findings: [] } });
    expect(await refusal(credential.username, credential.secret)).toMatch(/Bad username or password/i);
  });

  it('lets only managers and admins register probes, and answers 404 for another farm’s unit or probe', async () => {
    const unitId = await newUnit();
    const byHand = await hand.post(`/api/farms/${farmId}/probes`).send({ label: 'x', unitId, quantities: ['ph'] });
    expect(byHand.status).toBe(403);
    const byPlanner = await planner.post(`/api/farms/${farmId}/probes`).send({ label: 'x', unitId, quantities: ['ph'] });
    expect(byPlanner.status).toBe(403);
    const foreignUnit = await otherManager.post(`/api/farms/${otherFarmId}/probes`).send({ label: 'x', unitId, quantities: ['ph'] });
    expect(foreignUnit.status).toBe(404);
    const { probe } = await newProbe();
    expect((await otherManager.get(`/api/farms/${otherFarmId}/probes/${probe.id}`)).status).toBe(404);
    expect((await otherManager.post(`/api/farms/${otherFarmId}/probes/${probe.id}/credential`)).status).toBe(404);
    const dup = await manager.post(`/api/farms/${farmId}/probes`).send({ label: 'x', unitId, quantities: ['ph', 'ph'] });
    expect(dup.status).toBe(400);
    expect(dup.body.error.details.fieldErrors.quantities).toBeDefined();
  });

  it('answers the ingest counters to managers, not to hands', async () => {
    const res = await manager.get(`/api/farms/${farmId}/ingest`);
    expect(res.status).toBe(200);
    expect(res.body.broker).toMatchObject({
      messages: expect.any(Number),
      readingsStored: expect.any(Number),
      refusedConnections: expect.any(Number),
    });
    expect(res.body.broker.refusedConnections).toBeGreaterThan(0); // the refused old secrets above
    expect((await hand.get(`/api/farms/${farmId}/ingest`)).status).toBe(403);
  });
});

describe('calibrations', () => {
  it('computes the pH electrode slope and offset from two buffers: −5.0 mV at 7.00 and +168.0 mV at 4.01 is 97.8 %', async () => {
    const { probe } = await newProbe();
    const res = await manager.post(`/api/farms/${farmId}/probes/${probe.id}/calibrations`).send({
      quantity: 'ph',
      buffers: [
        { pH: 7.0, mV: -5.0 },
        { pH: 4.01, mV: 168.0 },
      ],
      check: { bufferPh: 10.01, readPh: 10.05 },
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ quantity: 'ph', passed: true, details: { slopePct: 97.8, offsetMv: -5, failures: [] } });
    const days = (Date.parse(res.body.nextDueAt) - Date.parse(res.body.performedAt)) / 86_400_000;
    expect(days).toBeCloseTo(30, 6);
    const list = await hand.get(`/api/farms/${farmId}/probes/${probe.id}/calibrations`);
    expect(list.body.calibrations.map((c: { id: string }) => c.id)).toEqual([res.body.id]);
  });

  it('fails a weak electrode or a check buffer off by more than 0.1, and leaves the probe due', async () => {
    const { probe } = await newProbe();
    const weak = await manager.post(`/api/farms/${farmId}/probes/${probe.id}/calibrations`).send({
      quantity: 'ph',
      buffers: [
        { pH: 7.0, mV: 0 },
        { pH: 4.0, mV: 150 },
      ],
    });
    expect(weak.body).toMatchObject({ passed: false, details: { failures: ['slope outside 95–105 % of Nernst'] } });
    expect(weak.body.nextDueAt).toBe(weak.body.performedAt);
    const offCheck = await manager.post(`/api/farms/${farmId}/probes/${probe.id}/calibrations`).send({
      quantity: 'ph',
      buffers: [
        { pH: 7.0, mV: -5.0 },
        { pH: 4.01, mV: 168.0 },
      ],
      check: { bufferPh: 10.01, readPh: 10.2 },
    });
    expect(offCheck.body.passed).toBe(false);
    expect(finding(await healthOf(probe.id), 'calibration_due')).toBeDefined();
  });

  it('answers 400 for buffers too close together or a quantity the probe does not measure', async () => {
    const { probe } = await newProbe();
    const close = await manager.post(`/api/farms/${farmId}/probes/${probe.id}/calibrations`).send({
      quantity: 'ph',
      buffers: [
        { pH: 7.0, mV: 0 },
        { pH: 7.2, mV: -12 },
      ],
    });
    expect(close.status).toBe(400);
    expect(close.body.error.details.fieldErrors.buffers[0]).toMatch(/0\.5 pH apart/);
    const cond = await manager
      .post(`/api/farms/${farmId}/probes/${probe.id}/calibrations`)
      .send({ quantity: 'specific_conductance', standard: 12.88, reading: 12.9 });
    expect(cond.status).toBe(400);
    expect(cond.body.error.details.fieldErrors.quantity).toBeDefined();
    expect(
      (await hand.post(`/api/farms/${farmId}/probes/${probe.id}/calibrations`).send({ quantity: 'dissolved_oxygen', passed: true })).status,
    ).toBe(403);
  });
});

describe('probe health', () => {
  it('finds a probe silent after the configured missed intervals, and in a maintenance window reports maintenance instead', async () => {
    const { probe } = await newProbe();
    const now = new Date();
    // Interval 60 s × 5 missed intervals (default) = 5 minutes; the last reading is 12 minutes old.
    await insertReadings(t.ds, [{ probeId: probe.id, quantity: 'ph', at: new Date(now.getTime() - 12 * MIN), value: 7.5 }]);
    const silent = await healthOf(probe.id, now);
    expect(silent.state).toBe('silent');
    expect(finding(silent, 'silent')).toMatchObject({
      thresholdSeconds: 300,
      silentForSeconds: 720,
      lastReadingAt: new Date(now.getTime() - 12 * MIN).toISOString(),
    });

    const w = await manager.post(`/api/farms/${farmId}/probes/${probe.id}/maintenance-windows`).send({
      startsAt: new Date(now.getTime() - 30 * MIN).toISOString(),
      endsAt: new Date(now.getTime() + 60 * MIN).toISOString(),
      reason: 'cleaning the DO membrane',
    });
    expect(w.status).toBe(201);
    expect(w.body.current).toBe(true);
    const inWindow = await healthOf(probe.id, now);
    expect(inWindow.state).toBe('maintenance');
    expect(kinds(inWindow)).not.toContain('silent');
    expect(finding(inWindow, 'maintenance')).toMatchObject({ windowId: w.body.id, reason: 'cleaning the DO membrane' });

    // Cancelled: silent again (and cancelling twice is harmless).
    expect((await manager.delete(`/api/farms/${farmId}/probes/${probe.id}/maintenance-windows/${w.body.id}`)).status).toBe(204);
    expect((await manager.delete(`/api/farms/${farmId}/probes/${probe.id}/maintenance-windows/${w.body.id}`)).status).toBe(204);
    expect((await healthOf(probe.id, now)).state).toBe('silent');
  });

  it('honours the farm setting for how many missed intervals make a probe silent', async () => {
    const { probe } = await newProbe({ intervalSeconds: 300 });
    const now = new Date();
    await insertReadings(t.ds, [{ probeId: probe.id, quantity: 'ph', at: new Date(now.getTime() - 20 * MIN), value: 7.5 }]);
    expect((await healthOf(probe.id, now)).state).not.toBe('silent'); // 20 min < 5 × 5 min
    await t.services.farms.update(farmId, { settings: { silentAfterMissedIntervals: 3 } }, null, 'admin');
    try {
      expect((await healthOf(probe.id, now)).state).toBe('silent'); // 20 min > 3 × 5 min
    } finally {
      await t.services.farms.update(farmId, { settings: { silentAfterMissedIntervals: 5 } }, null, 'admin');
    }
  });

  it('finds a flatline after 30 identical readings over 30 minutes, spikes from suspect readings, and uncalibrated quantities due', async () => {
    const { probe } = await newProbe();
    const now = new Date();
    const at = (m: number) => new Date(now.getTime() - m * MIN);
    await insertReadings(t.ds, [
      // pH varied, then stuck at 7.42 for the last 45 minutes.
      ...Array.from({ length: 30 }, (_, i) => ({ probeId: probe.id, quantity: 'ph', at: at(90 - i), value: 7 + i / 50 })),
      ...Array.from({ length: 45 }, (_, i) => ({ probeId: probe.id, quantity: 'ph', at: at(45 - i), value: 7.42 })),
      // Temperature moves: no flatline. Two DO readings were flagged suspect by ingest.
      ...Array.from({ length: 45 }, (_, i) => ({ probeId: probe.id, quantity: 'water_temperature', at: at(45 - i), value: 24 + i / 100 })),
      { probeId: probe.id, quantity: 'dissolved_oxygen', at: at(300), value: 6.1 },
      { probeId: probe.id, quantity: 'dissolved_oxygen', at: at(200), value: 14.9, quality: 'suspect' },
      { probeId: probe.id, quantity: 'dissolved_oxygen', at: at(100), value: 0.2, quality: 'suspect' },
      { probeId: probe.id, quantity: 'dissolved_oxygen', at: at(26 * 60), value: 0.1, quality: 'suspect' }, // older than 24 h
    ]);
    const h = await healthOf(probe.id, now);
    expect(h.state).toBe('attention');
    expect(finding(h, 'flatline')).toMatchObject({ quantity: 'ph', value: 7.42, readings: 45, sinceAt: at(45).toISOString(), minutes: 44 });
    expect(h.findings.filter((f) => f.kind === 'flatline')).toHaveLength(1);
    expect(finding(h, 'spike')).toMatchObject({ quantity: 'dissolved_oxygen', suspectCount: 2, lastAt: at(100).toISOString() });
    const due = h.findings
      .filter((f) => f.kind === 'calibration_due')
      .map((f) => (f as { quantity: string }).quantity)
      .sort();
    expect(due).toEqual(['dissolved_oxygen', 'ph']); // water temperature needs no calibration

    await manager
      .post(`/api/farms/${farmId}/probes/${probe.id}/calibrations`)
      .send({ quantity: 'dissolved_oxygen', passed: true, details: { airSaturationPct: 100.2 } });
    const after = await healthOf(probe.id, now);
    expect(after.findings.filter((f) => f.kind === 'calibration_due').map((f) => (f as { quantity: string }).quantity)).toEqual(['ph']);
  });

  it('finds drift when the probe reads 0.5 pH above the handheld values typed with the last kit tests', async () => {
    const { probe, unitId } = await newProbe();
    const now = Date.now();
    for (let i = 0; i < 5; i++) {
      const sampledAt = new Date(now - (i + 1) * 86_400_000);
      await t.ds.query(
        `INSERT INTO water_tests (farm_id, unit_id, client_id, analyte, method, basis, value, unit, sampled_at, handheld_ph, handheld_temperature_c)
         VALUES ($1, $2, $3, 'total_ammonia', 'salicylate', 'tan-n', 0.5, 'mg/L', $4, 7.2, 25.0)`,
        [farmId, unitId, randomUUID(), sampledAt],
      );
      // The probe reading nearest to the test is 4 minutes after it (inside ±15 min); one far outside is ignored.
      await insertReadings(t.ds, [
        { probeId: probe.id, quantity: 'ph', at: new Date(sampledAt.getTime() + 4 * MIN), value: 7.7 },
        { probeId: probe.id, quantity: 'ph', at: new Date(sampledAt.getTime() + 40 * MIN), value: 9.9 },
        { probeId: probe.id, quantity: 'water_temperature', at: new Date(sampledAt.getTime() - 3 * MIN), value: 25.4 },
      ]);
    }
    const h = await healthOf(probe.id, new Date(now));
    expect(finding(h, 'drift')).toEqual({ kind: 'drift', quantity: 'ph', meanDifference: 0.5, threshold: 0.3, pairs: 5 });
    expect(h.findings.filter((f) => f.kind === 'drift')).toHaveLength(1); // temperature 0.4 °C off: within 1 °C

    // A passed pH calibration starts the comparison afresh.
    await manager.post(`/api/farms/${farmId}/probes/${probe.id}/calibrations`).send({
      quantity: 'ph',
      buffers: [
        { pH: 7.0, mV: -5.0 },
        { pH: 4.01, mV: 168.0 },
      ],
    });
    expect(finding(await healthOf(probe.id, new Date(now)), 'drift')).toBeUndefined();
  });

  it('answers health with the probe list, including reject counts from ingest', async () => {
    const { probe, credential } = await newProbe();
    const client = await connect(credential.username, credential.secret);
    await client.publishAsync(credential.topic, 'not json', { qos: 1 });
    await client.publishAsync(credential.topic, onePh(99), { qos: 1 });
    // Rejects are folded into probe_rejects every 2 s.
    const deadline = Date.now() + 8000;
    let rejects: Array<{ reason: string; count: number }> = [];
    while (Date.now() < deadline) {
      const res = await hand.get(`/api/farms/${farmId}/probes/${probe.id}`);
      rejects = res.body.health.rejects;
      if (rejects.length >= 2) break;
      await new Promise((r) => setTimeout(r, 250));
    }
    expect(rejects.map((r) => [r.reason, r.count]).sort()).toEqual([
      ['malformed_json', 1],
      ['out_of_range', 1],
    ]);
    const list = await planner
      .get(`/api/farms/${farmId}/probes`)
      .query({ unitId: (await t.ds.query('SELECT unit_id FROM probes WHERE id = $1', [probe.id]))[0].unit_id });
    expect(list.body.probes.map((p: { id: string }) => p.id)).toEqual([probe.id]);
  });
});
