// The server (and its embedded broker) goes away under a publishing probe, once politely (SIGTERM,
// graceful shutdown) and once not (SIGKILL), and comes back on the same ports. QoS 1 with a probe
// that keeps unacknowledged messages means every reading arrives; re-sends of messages whose rows
// were already committed when the PUBACK was lost are skipped by the readings primary key.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDatabase, type TestDatabase } from '../setup/test-db';
import { demoEmail } from '../factories/demo';
import { brokerCounters, faultFixture, report, signInTo, storedInstants, type FaultFixture } from './support/fixture';
import { allocatePorts, errorLines, sleep, startServerProcess, type ChildHandle, type ServerPorts } from './support/processes';
import { startPublisher, VALUES_PER_MESSAGE, type Publisher } from './support/publisher';

let db: TestDatabase;
let f: FaultFixture;
let ports: ServerPorts;
let server: ChildHandle | null = null;
let publisher: Publisher | null = null;

beforeAll(async () => {
  db = await createTestDatabase();
  f = await faultFixture({ databaseUrl: db.databaseUrl });
  ports = await allocatePorts();
  server = await startServerProcess(f.env, ports);
});

afterAll(async () => {
  await publisher?.end();
  await server?.kill();
  await f?.close();
  await db?.drop();
});

describe('a server restart during ingest', () => {
  it('stores every reading a QoS 1 probe sent exactly once through a SIGTERM restart and a SIGKILL restart', async () => {
    const started = Date.now();
    const baseUrl = `http://127.0.0.1:${ports.httpPort}`;
    const cookie = await signInTo(baseUrl, demoEmail('manager'));
    publisher = await startPublisher({
      brokerUrl: `mqtt://127.0.0.1:${ports.mqttPort}`,
      probeKey: f.probe.probeKey,
      secret: f.probe.secret,
      // One sample a second of probe time, starting an hour ago: all inside the accepted window.
      firstAtMs: Math.floor(Date.now() / 1000) * 1000 - 3600_000,
    });
    const p = publisher;
    // 40 messages a second. After a reconnect mqtt.js replays its store one message per PUBACK, so a
    // higher rate only makes the replay after each restart longer.
    p.startPublishing(25);
    // Duplicates the brokers skipped (each process counts from its own start; read just before it goes).
    let duplicates = 0;

    await sleep(1500);
    const beforeTerm = p.stats.acked;
    duplicates += (await brokerCounters(baseUrl, f.farmId, cookie)).readingsDuplicate;
    const t0 = Date.now();
    const termExit = await server!.stop();
    const stopMs = Date.now() - t0;
    // Graceful: the shutdown ran to the end (exit 0) and did not pass its deadline.
    expect(termExit.code).toBe(0);
    const t1 = Date.now();
    server = await startServerProcess(f.env, ports, 'server#2');
    const restartMs = Date.now() - t1;
    await sleep(1500);
    const beforeKill = p.stats.acked;
    duplicates += (await brokerCounters(baseUrl, f.farmId, cookie)).readingsDuplicate;
    await server.kill();
    server = await startServerProcess(f.env, ports, 'server#3');
    await sleep(1500);
    p.stopPublishing();
    const t2 = Date.now();
    await p.settle(60_000);
    const settleMs = Date.now() - t2;
    duplicates += (await brokerCounters(baseUrl, f.farmId, cookie)).readingsDuplicate;

    const stored = await storedInstants(f.ds, f.probe.probeId);
    const lost = p.sentAt.filter((at) => stored.get(at) !== VALUES_PER_MESSAGE);
    const sent = new Set(p.sentAt);
    const unexpected = [...stored.keys()].filter((at) => !sent.has(at));
    const rows = [...stored.values()].reduce((a, b) => a + b, 0);
    report('server restart (SIGTERM, then SIGKILL)', {
      sent: p.stats.sent,
      acked: p.stats.acked,
      stored: stored.size,
      storedRows: rows,
      duplicates: duplicates / VALUES_PER_MESSAGE,
      lost: lost.length,
      wireResends: p.stats.wirePublishes - p.stats.sent,
      republished: p.stats.republished,
      reconnects: p.stats.closes,
      gracefulStopMs: stopMs,
      serverStartMs: restartMs,
      settleMs,
      seconds: ((Date.now() - started) / 1000).toFixed(1),
    });
    // The restarts really happened mid-stream: acknowledgements before each, and messages after.
    expect(beforeTerm).toBeGreaterThan(0);
    expect(beforeKill).toBeGreaterThan(beforeTerm);
    expect(p.stats.closes).toBeGreaterThanOrEqual(2);
    expect(lost).toEqual([]);
    expect(unexpected).toEqual([]);
    expect(stored.size).toBe(p.stats.sent);
    expect(rows).toBe(p.stats.sent * VALUES_PER_MESSAGE);
    expect(errorLines(server)).toEqual([]);
  });
});
