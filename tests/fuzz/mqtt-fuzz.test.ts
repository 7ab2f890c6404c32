// MQTT fuzz: an authenticated probe publishes over ten thousand malformed or hostile payloads (broken
// JSON, wrong types, NaN/Infinity as strings, huge numbers, 300 KB messages, unknown quantities,
// timestamps far ahead or long ago, deep nesting, __proto__ keys, Unicode junk), pipelined. The
// broker stays up and keeps the connection, stores nothing, and counts every reject with its reason,
// in its counters and in probe_rejects, exactly as many as were sent. Raw garbage on the TCP port
// does not bring it down either.
import { connect as tcpConnect } from 'node:net';
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readingsTopic } from '../../shared/mqtt/topics';
import { MAX_READINGS_PAYLOAD_BYTES } from '../../shared/schemas/mqtt.schema';
import { seedDemoFarms } from '../factories/demo';
import { createProbe } from '../factories/probes';
import { startTestApp, type TestApp } from '../setup/test-app';
import { fuzzCorpus, type FuzzCase, type RejectReason } from './support/mqtt-payloads';

const SEED = 20_261_201;
const COUNT = 10_000;
const LARGE = 30;
const IN_FLIGHT = 256;

let t: TestApp;
let farmId: string;
let unitId: string;
const clients: MqttClient[] = [];

beforeAll(async () => {
  t = await startTestApp({ broker: true, env: { INGEST_FLUSH_MS: '10' } });
  const seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  unitId = seed.units['harrow-bend:P1']!;
});
afterAll(async () => {
  await Promise.all(clients.map((c) => c.endAsync(true).catch(() => undefined)));
  await t.close();
});

async function connectProbe(probe: { probeKey: string; secret: string }) {
  const c = await mqtt.connectAsync(`mqtt://127.0.0.1:${t.broker!.port}`, {
    protocolVersion: 4,
    clientId: probe.probeKey,
    username: probe.probeKey,
    password: probe.secret,
    reconnectPeriod: 0,
  });
  clients.push(c);
  return c;
}

/** Publishes every payload with QoS 1, at most `window` unacknowledged at a time. */
function publishAll(client: MqttClient, topic: string, cases: FuzzCase[], window: number): Promise<void> {
  return new Promise((resolve, reject) => {
    let next = 0;
    let inFlight = 0;
    let done = 0;
    const pump = () => {
      while (inFlight < window && next < cases.length) {
        const c = cases[next++]!;
        inFlight++;
        client.publish(topic, c.payload, { qos: 1 }, (err) => {
          inFlight--;
          done++;
          if (err) return reject(new Error(`publish of a ${c.kind} payload failed: ${err.message}`));
          if (done === cases.length) resolve();
          else pump();
        });
      }
    };
    client.once('close', () => reject(new Error(`the broker closed the connection after ${done} of ${cases.length} payloads`)));
    pump();
  });
}

/** Raw bytes on the MQTT port: random junk, a CONNECT with a bogus protocol, a huge remaining length. */
async function tcpGarbage(port: number, rounds: number): Promise<number> {
  let closedByBroker = 0;
  const frames: Buffer[] = [];
  for (let i = 0; i < rounds; i++) {
    const junk = Buffer.alloc(64 + (i % 200));
    for (let k = 0; k < junk.length; k++) junk[k] = (i * 31 + k * 17) % 256;
    frames.push(
      i % 4 === 0
        ? junk
        : i % 4 === 1
          ? Buffer.concat([Buffer.from([0x10, 0x10, 0x00, 0x04]), Buffer.from('MQTX'), junk])
          : i % 4 === 2
            ? Buffer.from([0x10, 0xff, 0xff, 0xff, 0x7f, 0x00])
            : Buffer.concat([Buffer.from([0x30, 0x05, 0x00, 0x01, 0x23]), junk]), // PUBLISH before CONNECT
    );
  }
  await Promise.all(
    frames.map(
      (frame) =>
        new Promise<void>((resolve) => {
          const socket = tcpConnect(port, '127.0.0.1');
          const timer = setTimeout(() => {
            socket.destroy();
            resolve();
          }, 3000);
          socket.on('error', () => undefined);
          socket.once('connect', () => socket.write(frame));
          socket.once('close', () => {
            clearTimeout(timer);
            closedByBroker++;
            resolve();
          });
        }),
    ),
  );
  return closedByBroker;
}

describe('MQTT payload fuzz', () => {
  it(`counts ${COUNT + LARGE} malformed or hostile payloads with their reasons, stores nothing and stays up`, async () => {
    const started = Date.now();
    const probe = await createProbe(t.ds, farmId, unitId, ['ph', 'dissolved_oxygen', 'water_temperature']);
    const cases = fuzzCorpus({ nowMs: Date.now(), count: COUNT, large: LARGE, seed: SEED });
    const generatedMs = Date.now() - started;
    const expected: Partial<Record<RejectReason, number>> = {};
    for (const c of cases) expected[c.reason] = (expected[c.reason] ?? 0) + c.rejects;
    const expectedTotal = Object.values(expected).reduce((a, b) => a + b, 0);
    expect(cases.filter((c) => c.reason === 'too_large').every((c) => c.payload.length > MAX_READINGS_PAYLOAD_BYTES)).toBe(true);

    const before = t.broker!.counters();
    const client = await connectProbe(probe);
    let closes = 0;
    client.on('close', () => closes++);
    const t0 = Date.now();
    await publishAll(client, readingsTopic(probe.probeKey), cases, IN_FLIGHT);
    const publishMs = Date.now() - t0;
    const after = t.broker!.counters();

    // No prototype was polluted by a __proto__ or constructor key on the way through.
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(Object.keys(Object.prototype)).toEqual([]);

    const counted: Record<string, number> = {};
    for (const [reason, n] of Object.entries(after.rejects)) {
      const d = n - (before.rejects[reason] ?? 0);
      if (d) counted[reason] = d;
    }
    const stored = ((await t.ds.query('SELECT count(*)::int AS n FROM readings WHERE probe_id = $1', [probe.probeId])) as Array<{ n: number }>)[0]!.n;

    // Reject counts are folded into probe_rejects every 2 s.
    const deadline = Date.now() + 15_000;
    let table: Record<string, number> = {};
    for (;;) {
      const rows = (await t.ds.query('SELECT reason, count::int AS n FROM probe_rejects WHERE probe_key = $1', [probe.probeKey])) as Array<{ reason: string; n: number }>;
      table = Object.fromEntries(rows.map((r) => [r.reason, r.n]));
      if (Object.values(table).reduce((a, b) => a + b, 0) >= expectedTotal || Date.now() > deadline) break;
      await new Promise((r) => setTimeout(r, 250));
    }

    // Raw garbage on the port, then a well-formed message from a fresh probe still gets in.
    const garbageClosed = await tcpGarbage(t.broker!.port, 200);
    const sentinel = await createProbe(t.ds, farmId, unitId);
    const ok = await connectProbe(sentinel);
    await ok.publishAsync(
      readingsTopic(sentinel.probeKey),
      JSON.stringify({ v: 1, samples: [{ at: new Date(Date.now() - 60_000).toISOString(), values: [{ quantity: 'ph', value: 7.7, unit: 'pH' }] }] }),
      { qos: 1 },
    );
    const sentinelStored = ((await t.ds.query('SELECT count(*)::int AS n FROM readings WHERE probe_id = $1', [sentinel.probeId])) as Array<{ n: number }>)[0]!.n;

    const kinds: Record<string, number> = {};
    for (const c of cases) kinds[c.kind] = (kinds[c.kind] ?? 0) + 1;
    console.log(
      `[fuzz] mqtt: sent=${cases.length} bytes=${cases.reduce((a, c) => a + c.payload.length, 0)} stored=${stored} rejects=${expectedTotal} ` +
        `counted=${JSON.stringify(counted)} probe_rejects=${JSON.stringify(table)} kinds=${JSON.stringify(kinds)} ` +
        `closes=${closes} garbageConnections=200 closedWithin3s=${garbageClosed} generateMs=${generatedMs} publishMs=${publishMs} seed=${SEED}`,
    );

    expect(cases.length).toBeGreaterThanOrEqual(10_000);
    expect(stored).toBe(0);
    expect(after.messages - before.messages).toBe(cases.length);
    expect(after.readingsStored - before.readingsStored).toBe(0);
    expect(counted).toEqual(expected);
    expect(table).toEqual(expected);
    expect(closes).toBe(0);
    // Most garbage connections are closed at once; one whose first bytes announce a longer packet than
    // was sent is held until aedes' connect timeout (30 s), like in any MQTT broker. Either way the
    // broker still serves a well-formed probe afterwards.
    expect(garbageClosed).toBeGreaterThan(150);
    expect(t.broker!.status().status).toBe('ok');
    expect(sentinelStored).toBe(1);
  });

  it('counts a payload whose key holds a NUL character, and the probes\' last-seen times keep being stored', async () => {
    const probe = await createProbe(t.ds, farmId, unitId);
    const other = await createProbe(t.ds, farmId, unitId);
    const c = await connectProbe(probe);
    const o = await connectProbe(other);
    const at = new Date(Date.now() - 60_000).toISOString();
    // The zod message quotes the key ('Unrecognized key: "\u0000"'); the detail is what probe_rejects stores.
    await c.publishAsync(readingsTopic(probe.probeKey), `{"v":1,"\\u0000":1,"samples":[{"at":"${at}","values":[{"quantity":"ph","value":7,"unit":"pH"}]}]}`, { qos: 1 });
    await o.publishAsync(readingsTopic(other.probeKey), JSON.stringify({ v: 1, batteryPct: 64, samples: [{ at, values: [{ quantity: 'ph', value: 7.2, unit: 'pH' }] }] }), { qos: 1 });
    const deadline = Date.now() + 10_000;
    let rows: Array<{ n: number; detail: string }> = [];
    let seen: Array<{ battery: number | null }> = [];
    while (Date.now() < deadline) {
      rows = (await t.ds.query(`SELECT count::int AS n, last_detail AS detail FROM probe_rejects WHERE probe_key = $1 AND reason = 'invalid_payload'`, [probe.probeKey])) as typeof rows;
      seen = (await t.ds.query('SELECT battery_pct AS battery FROM probes WHERE id = $1 AND last_seen_at IS NOT NULL', [other.probeId])) as typeof seen;
      if (rows.length && seen.length) break;
      await new Promise((r) => setTimeout(r, 200));
    }
    expect(rows).toEqual([{ n: 1, detail: expect.stringMatching(/^\(root\): Unrecognized key/) }]);
    expect(rows[0]!.detail).not.toContain('\u0000');
    expect(seen).toEqual([{ battery: 64 }]);
  });
});
