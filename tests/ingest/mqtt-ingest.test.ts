import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readingsTopic } from '../../shared/mqtt/topics';
import { startTestApp, type TestApp } from '../setup/test-app';
import { seedDemoFarms } from '../factories/demo';
import { createProbe } from '../factories/probes';
import type { SeedResult } from '../../server/db/seed/seed';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
const clients: MqttClient[] = [];

beforeAll(async () => {
  t = await startTestApp({ broker: true, env: { INGEST_FLUSH_MS: '10' } });
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
});
afterAll(async () => {
  await Promise.all(clients.map((c) => c.endAsync(true).catch(() => undefined)));
  await t.close();
});

const url = () => `mqtt://127.0.0.1:${t.broker!.port}`;
async function connect(username: string, password: string, extra: mqtt.IClientOptions = {}) {
  const c = await mqtt.connectAsync(url(), { protocolVersion: 4, username, password, clientId: username, reconnectPeriod: 0, ...extra });
  clients.push(c);
  return c;
}
const payload = (samples: Array<{ at: string; values: Array<{ quantity: string; value: number; unit: string }> }>) => JSON.stringify({ v: 1, samples });
const count = async (probeId: string) => ((await t.ds.query('SELECT count(*)::int AS n FROM readings WHERE probe_id = $1', [probeId])) as Array<{ n: number }>)[0]!.n;

describe('probe ingest over MQTT', () => {
  it('stores readings in canonical units once the broker has acknowledged them, °F as °C and conductivity as salinity', async () => {
    const unitId = seed.units['harrow-bend:S2']!;
    const p = await createProbe(t.ds, farmId, unitId, ['water_temperature', 'specific_conductance']);
    const c = await connect(p.probeKey, p.secret);
    const at = new Date(Date.now() - 60_000).toISOString();
    await c.publishAsync(
      readingsTopic(p.probeKey),
      payload([{ at, values: [{ quantity: 'water_temperature', value: 77, unit: 'F' }, { quantity: 'specific_conductance', value: 53065, unit: 'uS/cm' }] }]),
      { qos: 1 },
    );
    // The PUBACK came back: the rows are durable now, no waiting.
    const rows = (await t.ds.query('SELECT quantity, value FROM readings WHERE probe_id = $1 ORDER BY quantity', [p.probeId])) as Array<{ quantity: string; value: number }>;
    const byQ = Object.fromEntries(rows.map((r) => [r.quantity, r.value]));
    expect(byQ.water_temperature).toBeCloseTo(25, 10); // (77 − 32) × 5/9, exact definition
    expect(byQ.specific_conductance).toBeCloseTo(53.065, 10);
    // PSS-78 at 25 °C: 53.065 mS/cm ↔ S 35 (water-chemistry.md §4, computed); within 0.005 (ITS-90 vs IPTS-68).
    expect(Math.abs(byQ.salinity! - 35)).toBeLessThan(0.005);
  });

  it('stores the same message sent twice once', async () => {
    const p = await createProbe(t.ds, farmId, seed.units['harrow-bend:P1']!);
    const c = await connect(p.probeKey, p.secret);
    const msg = payload([{ at: new Date(Date.now() - 120_000).toISOString(), values: [{ quantity: 'ph', value: 7.9, unit: 'pH' }, { quantity: 'dissolved_oxygen', value: 6.2, unit: 'mg/L' }] }]);
    await c.publishAsync(readingsTopic(p.probeKey), msg, { qos: 1 });
    await c.publishAsync(readingsTopic(p.probeKey), msg, { qos: 1 });
    expect(await count(p.probeId)).toBe(2);
  });

  it('refuses a wrong password', async () => {
    const p = await createProbe(t.ds, farmId, seed.units['harrow-bend:P1']!);
    await expect(mqtt.connectAsync(url(), { protocolVersion: 4, username: p.probeKey, password: 'wrong', reconnectPeriod: 0 })).rejects.toThrow(/Bad username or password/);
  });

  it("refuses a probe publishing to another probe's topic, stores nothing, and closes its connection", async () => {
    const a = await createProbe(t.ds, farmId, seed.units['harrow-bend:P1']!);
    const b = await createProbe(t.ds, farmId, seed.units['harrow-bend:P2']!);
    const c = await connect(a.probeKey, a.secret);
    const closed = new Promise<void>((resolve) => c.once('close', () => resolve()));
    c.publish(readingsTopic(b.probeKey), payload([{ at: new Date().toISOString(), values: [{ quantity: 'ph', value: 8, unit: 'pH' }] }]), { qos: 1 });
    await closed;
    expect(await count(b.probeId)).toBe(0);
    expect(t.broker!.counters().refusedTopics).toBeGreaterThan(0);
  });

  it('grants no subscription, not even to #', async () => {
    const p = await createProbe(t.ds, farmId, seed.units['harrow-bend:P1']!);
    const c = await connect(p.probeKey, p.secret);
    // The SUBACK carries the failure code 128, which mqtt.js reports as a subscribe error.
    await expect(c.subscribeAsync('#', { qos: 1 })).rejects.toThrow(/Subscribe error/);
    await expect(c.subscribeAsync(readingsTopic(p.probeKey), { qos: 1 })).rejects.toThrow(/Subscribe error/);
  });

  it('counts a malformed payload with its reason, stores nothing and still acknowledges it', async () => {
    const p = await createProbe(t.ds, farmId, seed.units['harrow-bend:P1']!);
    const c = await connect(p.probeKey, p.secret);
    await c.publishAsync(readingsTopic(p.probeKey), '{"v":1,"samples":[{"at":"yesterday","values":[]}]}', { qos: 1 });
    await c.publishAsync(readingsTopic(p.probeKey), 'not json at all', { qos: 1 });
    await c.publishAsync(readingsTopic(p.probeKey), payload([{ at: new Date().toISOString(), values: [{ quantity: 'ph', value: 19, unit: 'pH' }] }]), { qos: 1 });
    expect(await count(p.probeId)).toBe(0);
    await new Promise((r) => setTimeout(r, 2300)); // reject counters are folded into the table every 2 s
    const rejects = (await t.ds.query('SELECT reason, count::int AS n FROM probe_rejects WHERE probe_key = $1 ORDER BY reason', [p.probeKey])) as Array<{ reason: string; n: number }>;
    expect(rejects).toEqual([
      { reason: 'invalid_payload', n: 1 },
      { reason: 'malformed_json', n: 1 },
      { reason: 'out_of_range', n: 1 },
    ]);
  });

  it('flags a pH jump of 2 units in a minute as suspect instead of dropping it', async () => {
    const p = await createProbe(t.ds, farmId, seed.units['harrow-bend:P1']!);
    const c = await connect(p.probeKey, p.secret);
    const t0 = Date.now() - 10 * 60_000;
    await c.publishAsync(
      readingsTopic(p.probeKey),
      payload([
        { at: new Date(t0).toISOString(), values: [{ quantity: 'ph', value: 7.5, unit: 'pH' }] },
        { at: new Date(t0 + 60_000).toISOString(), values: [{ quantity: 'ph', value: 9.6, unit: 'pH' }] },
      ]),
      { qos: 1 },
    );
    const rows = (await t.ds.query('SELECT value, quality FROM readings WHERE probe_id = $1 ORDER BY at', [p.probeId])) as Array<{ value: number; quality: string }>;
    expect(rows).toEqual([{ value: 7.5, quality: 'good' }, { value: 9.6, quality: 'suspect' }]);
  });

  it('accepts the documented mosquito_pub example shape from the command line', async () => {
    const p = await createProbe(t.ds, farmId, seed.units['harrow-bend:P3']!);
    const at = new Date(Date.now() - 30_000).toISOString().replace(/\.\d{3}Z$/, 'Z');
    const message = `{"v":1,"samples":[{"at":"${at}","values":[{"quantity":"ph","value":8.05,"unit":"pH"},{"quantity":"dissolved_oxygen","value":6.4,"unit":"mg/L"}]}]}`;
    // Never spawnSync a CLI that talks to this process's broker (it would block the event loop).
    await promisify(execFile)('mosquitto_pub', ['-h', '127.0.0.1', '-p', String(t.broker!.port), '-V', 'mqttv311', '-q', '1', '-i', p.probeKey, '-u', p.probeKey, '-P', p.secret, '-t', readingsTopic(p.probeKey), '-m', message]);
    expect(await count(p.probeId)).toBe(2);
  });

  it('keeps what a probe buffered while the broker was unreachable and stores it once it reconnects', async () => {
    const p = await createProbe(t.ds, farmId, seed.units['harrow-bend:P4']!);
    const c = await connect(p.probeKey, p.secret, { reconnectPeriod: 200, clean: false });
    // Cut the connection under the client: the library keeps QoS 1 messages it has not had acknowledged.
    t.broker!.disconnectProbe(p.probeKey);
    await new Promise((r) => setTimeout(r, 50));
    const sends = Array.from({ length: 20 }, (_, i) =>
      c.publishAsync(readingsTopic(p.probeKey), payload([{ at: new Date(Date.now() - (100 - i) * 60_000).toISOString(), values: [{ quantity: 'dissolved_oxygen', value: 5 + i / 10, unit: 'mg/L' }] }]), { qos: 1 }),
    );
    await Promise.all(sends);
    expect(await count(p.probeId)).toBe(20);
  });
});
