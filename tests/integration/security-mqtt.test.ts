// MQTT access control, from the point of view of someone holding a probe credential (or guessing
// one): CONNACK 4 for anything but the probe's own current secret, no topic but its own, no
// subscription at all, a rotated or deactivated credential refused at once, and no way to push
// another probe off the broker.
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readingsTopic } from '../../shared/mqtt/topics';
import type { SeedResult } from '../../server/db/seed/seed';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { createProbe } from '../factories/probes';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
let otherFarmId: string;
const clients: MqttClient[] = [];

beforeAll(async () => {
  t = await startTestApp({ broker: true, env: { INGEST_FLUSH_MS: '10' } });
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  otherFarmId = seed.farms['cedar-flats']!;
});
afterAll(async () => {
  await Promise.all(clients.map((c) => c.endAsync(true).catch(() => undefined)));
  await t.close();
});

const url = () => `mqtt://127.0.0.1:${t.broker!.port}`;
const unit = (code: string) => seed.units[`harrow-bend:${code}`]!;
async function connect(username: string, password: string, extra: mqtt.IClientOptions = {}) {
  const c = await mqtt.connectAsync(url(), { protocolVersion: 4, username, password, clientId: username, reconnectPeriod: 0, ...extra });
  clients.push(c);
  return c;
}
/** The CONNACK return code for these credentials (0 = accepted). */
async function connackCode(username: string | undefined, password: string | undefined, clientId?: string): Promise<number> {
  try {
    const c = await mqtt.connectAsync(url(), {
      protocolVersion: 4,
      reconnectPeriod: 0,
      connectTimeout: 5000,
      ...(username !== undefined ? { username } : {}),
      ...(password !== undefined ? { password } : {}),
      ...(clientId ? { clientId } : {}),
    });
    await c.endAsync(true);
    return 0;
  } catch (err) {
    return (err as { code?: number }).code ?? -1;
  }
}
const reading = () => JSON.stringify({ v: 1, samples: [{ at: new Date(Date.now() - 60_000).toISOString(), values: [{ quantity: 'ph', value: 7.9, unit: 'pH' }] }] });
const stored = async (probeId: string) =>
  ((await t.ds.query('SELECT count(*)::int AS n FROM readings WHERE probe_id = $1', [probeId])) as Array<{ n: number }>)[0]!.n;
const closeOf = (c: MqttClient) => new Promise<void>((resolve) => c.once('close', () => resolve()));
/** Rejects if `p` takes longer than `ms` ("at once" means within a second or two, not eventually). */
const within = <T>(ms: number, p: Promise<T>, what: string) =>
  Promise.race([p, new Promise<never>((_, reject) => setTimeout(() => reject(new Error(`${what} not within ${ms} ms`)), ms))]);

describe('MQTT credentials', () => {
  it('answers CONNACK 4 to a wrong secret, an unknown probe, a missing password, and another probe’s secret', async () => {
    const a = await createProbe(t.ds, farmId, unit('P1'));
    const b = await createProbe(t.ds, farmId, unit('P2'));
    expect(await connackCode(a.probeKey, 'wrong')).toBe(4);
    expect(await connackCode('no-such-probe', a.secret)).toBe(4);
    expect(await connackCode(a.probeKey, undefined)).toBe(4);
    expect(await connackCode(undefined, undefined)).toBe(4);
    expect(await connackCode(a.probeKey, '')).toBe(4);
    expect(await connackCode(a.probeKey, b.secret)).toBe(4);
    expect(await connackCode(a.probeKey, `${a.secret} `)).toBe(4);
    expect(await connackCode(a.probeKey.toUpperCase(), a.secret)).toBe(4);
    // The right one works.
    expect(await connackCode(a.probeKey, a.secret, a.probeKey)).toBe(0);
    expect(t.broker!.counters().refusedConnections).toBeGreaterThanOrEqual(8);
  });

  it('stops accepting a rotated secret at once: the live connection is closed and the old secret refused', async () => {
    const p = await createProbe(t.ds, farmId, unit('P3'));
    const c = await connect(p.probeKey, p.secret);
    const closed = closeOf(c);
    const manager = await signedIn(t.app, demoEmail('manager'));
    const t0 = Date.now();
    const res = await manager.post(`/api/farms/${farmId}/probes/${p.probeId}/credential`).set('x-gillwise-client', 'web');
    expect(res.status).toBe(200);
    expect(res.headers['cache-control']).toBe('no-store');
    const fresh = (res.body as { credential: { secret: string } }).credential.secret;
    expect(fresh).toBeTruthy();
    expect(fresh).not.toBe(p.secret);
    await closed;
    expect(Date.now() - t0).toBeLessThan(2000);
    expect(await connackCode(p.probeKey, p.secret, p.probeKey)).toBe(4);
    expect(await connackCode(p.probeKey, fresh, p.probeKey)).toBe(0);
    // The secret is stored only as a hash.
    const rows = (await t.ds.query('SELECT secret_hash FROM probes WHERE id = $1', [p.probeId])) as Array<{ secret_hash: string }>;
    expect(rows[0]!.secret_hash).not.toContain(fresh);
  });

  it('refuses a deactivated probe and closes its connection', async () => {
    const p = await createProbe(t.ds, farmId, unit('P4'));
    const c = await connect(p.probeKey, p.secret);
    const closed = closeOf(c);
    const manager = await signedIn(t.app, demoEmail('manager'));
    const res = await manager.post(`/api/farms/${farmId}/probes/${p.probeId}/deactivate`).set('x-gillwise-client', 'web');
    expect(res.status).toBe(200);
    await closed;
    expect(await connackCode(p.probeKey, p.secret, p.probeKey)).toBe(4);
  });

  it('does not let a manager of another farm rotate this farm’s probe credential', async () => {
    const p = await createProbe(t.ds, farmId, unit('P5'));
    const other = await signedIn(t.app, demoEmail('manager', 'cedarflats'));
    const own = await other.post(`/api/farms/${otherFarmId}/probes/${p.probeId}/credential`).set('x-gillwise-client', 'web');
    const theirs = await other.post(`/api/farms/${farmId}/probes/${p.probeId}/credential`).set('x-gillwise-client', 'web');
    expect(own.status).toBe(404);
    expect(theirs.status).toBe(404);
    expect(await connackCode(p.probeKey, p.secret, p.probeKey)).toBe(0);
  });
});

describe('MQTT topics', () => {
  it('closes the connection of a probe publishing anywhere but its own readings topic, and stores nothing', async () => {
    const a = await createProbe(t.ds, farmId, unit('P1'));
    const b = await createProbe(t.ds, farmId, unit('P2'));
    const foreignFarm = await createProbe(t.ds, otherFarmId, seed.units['cedar-flats:T1']!);
    const topics = [
      readingsTopic(b.probeKey),
      readingsTopic(foreignFarm.probeKey),
      `${readingsTopic(a.probeKey)}/extra`,
      `gillwise/v1/probes/${a.probeKey}`,
      `gillwise/v1/probes/${a.probeKey}/commands`,
      `gillwise/v2/probes/${a.probeKey}/readings`,
      `/gillwise/v1/probes/${a.probeKey}/readings`,
      '$SYS/broker/clients',
      'gillwise',
      'a',
    ];
    for (const topic of topics) {
      const c = await connect(a.probeKey, a.secret);
      const closed = closeOf(c);
      c.publish(topic, reading(), { qos: 1 });
      await closed;
    }
    expect(await stored(a.probeId)).toBe(0);
    expect(await stored(b.probeId)).toBe(0);
    expect(await stored(foreignFarm.probeId)).toBe(0);
  });

  it('grants no subscription: #, +/#, $SYS/#, another probe’s topic or its own', async () => {
    const p = await createProbe(t.ds, farmId, unit('P1'));
    const other = await createProbe(t.ds, farmId, unit('P2'));
    const c = await connect(p.probeKey, p.secret);
    for (const topic of ['#', '+/#', '$SYS/#', 'gillwise/#', readingsTopic(other.probeKey), readingsTopic(p.probeKey)]) {
      // The SUBACK carries the failure code 128, which mqtt.js reports as a subscribe error.
      await expect(c.subscribeAsync(topic, { qos: 1 }), topic).rejects.toThrow(/Subscribe error/);
    }
  });

  it('does not keep a retained message, and another probe never receives what a probe publishes', async () => {
    const p = await createProbe(t.ds, farmId, unit('P6'));
    const c = await connect(p.probeKey, p.secret);
    await c.publishAsync(readingsTopic(p.probeKey), reading(), { qos: 1, retain: true });
    expect(await stored(p.probeId)).toBe(1);
    const listener = await createProbe(t.ds, farmId, unit('P6'));
    const l = await connect(listener.probeKey, listener.secret);
    const received: string[] = [];
    l.on('message', (topic) => received.push(topic));
    await l.subscribeAsync(readingsTopic(p.probeKey)).catch(() => undefined);
    await new Promise((r) => setTimeout(r, 300));
    expect(received).toEqual([]);
  });
});

describe('MQTT client ids', () => {
  it('does not let one probe’s credential take over another probe’s client id and push it off the broker', async () => {
    const victim = await createProbe(t.ds, farmId, unit('P1'));
    const attacker = await createProbe(t.ds, farmId, unit('P2'));
    const v = await connect(victim.probeKey, victim.secret);
    let victimClosed = false;
    v.on('close', () => (victimClosed = true));
    // Same client id as the victim, with the attacker's own valid credential.
    const code = await connackCode(attacker.probeKey, attacker.secret, victim.probeKey);
    await new Promise((r) => setTimeout(r, 300));
    expect(code).toBe(2); // CONNACK 2, identifier rejected
    expect(victimClosed).toBe(false);
    await v.publishAsync(readingsTopic(victim.probeKey), reading(), { qos: 1 });
    expect(await stored(victim.probeId)).toBe(1);
  });

  it('does not let a probe squat another probe’s key as its client id while that probe is offline', async () => {
    const victim = await createProbe(t.ds, farmId, unit('P3'));
    const attacker = await createProbe(t.ds, farmId, unit('P4'));
    expect(await connackCode(attacker.probeKey, attacker.secret, victim.probeKey)).toBe(2);
    expect(await connackCode(victim.probeKey, victim.secret, victim.probeKey)).toBe(0);
  });

  it('closes every connection of a probe when its credential is rotated, whatever client ids they use', async () => {
    const p = await createProbe(t.ds, farmId, unit('P5'));
    const first = await connect(p.probeKey, p.secret, { clientId: p.probeKey });
    const second = await connect(p.probeKey, p.secret, { clientId: `${p.probeKey}/spare` });
    const closed = Promise.all([closeOf(first), closeOf(second)]);
    const manager = await signedIn(t.app, demoEmail('manager'));
    const res = await manager.post(`/api/farms/${farmId}/probes/${p.probeId}/credential`).set('x-gillwise-client', 'web');
    expect(res.status).toBe(200);
    await within(2000, closed, 'both connections closed');
  });
});
