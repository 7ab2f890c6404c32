// PostgreSQL goes away for OUTAGE_MS during ingest (a dedicated cluster, so the shared test
// database of other test files is not touched). While it is away the broker acknowledges nothing
// (a write that fails is refused, a new connection gets CONNACK 3), the probe keeps its messages,
// /api/health reports the database down, and the server process neither dies nor stalls. Once the
// database is back, ingest resumes and every message the broker acknowledged is in the database.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startDedicatedPostgres, type DedicatedPostgres } from './support/dedicated-stack';
import { faultFixture, report, storedInstants, type FaultFixture } from './support/fixture';
import { allocatePorts, sleep, startServerProcess, waitFor, type ChildHandle, type ServerPorts } from './support/processes';
import { startPublisher, VALUES_PER_MESSAGE, type Publisher } from './support/publisher';

/** How long the database stays down. */
const OUTAGE_MS = 15_000;

let pg: DedicatedPostgres;
let f: FaultFixture;
let ports: ServerPorts;
let server: ChildHandle | null = null;
let publisher: Publisher | null = null;

beforeAll(async () => {
  pg = await startDedicatedPostgres();
  f = await faultFixture({ databaseUrl: pg.databaseUrl });
  ports = await allocatePorts();
  server = await startServerProcess(f.env, ports);
});

afterAll(async () => {
  await publisher?.end();
  await server?.kill();
  await f?.close();
  await pg?.destroy();
});

type Health = { status: number; database?: string; elapsedMs: number };
async function health(baseUrl: string): Promise<Health> {
  const t0 = Date.now();
  try {
    const res = await fetch(`${baseUrl}/api/health`, { signal: AbortSignal.timeout(5000) });
    const body = (await res.json()) as { checks?: { database?: { status: string } } };
    return { status: res.status, database: body.checks?.database?.status, elapsedMs: Date.now() - t0 };
  } catch {
    return { status: 0, elapsedMs: Date.now() - t0 };
  }
}

describe('PostgreSQL stopped during ingest', () => {
  it(`stops acknowledging while the database is down for ${OUTAGE_MS / 1000} s, stays up, and loses nothing it acknowledged`, async () => {
    const started = Date.now();
    const baseUrl = `http://127.0.0.1:${ports.httpPort}`;
    const pid = server!.pid;
    publisher = await startPublisher({
      brokerUrl: `mqtt://127.0.0.1:${ports.mqttPort}`,
      probeKey: f.probe.probeKey,
      secret: f.probe.secret,
      firstAtMs: Math.floor(Date.now() / 1000) * 1000 - 3600_000,
    });
    const p = publisher;
    p.startPublishing(25);
    await sleep(2000);
    const ackedBefore = p.stats.acked;
    expect(ackedBefore).toBeGreaterThan(0);

    await pg.stop();
    const downAt = Date.now();
    // Anything in flight when the database went down settles within a moment (refused or acknowledged).
    await sleep(1500);
    const ackedAtStartOfOutage = p.stats.acked;
    const healthDuring: Health[] = [];
    while (Date.now() - downAt < OUTAGE_MS) {
      healthDuring.push(await health(baseUrl));
      await sleep(1000);
    }
    const ackedAtEndOfOutage = p.stats.acked;
    const ackedDuringOutage = p.ackTimes.filter((ms) => ms > downAt + 1500).length;
    expect(server!.alive()).toBe(true);

    await pg.start();
    const upAt = Date.now();
    // No worker runs in this test, so the overall status stays 503 (degraded): look at the database check.
    const healthy = await waitFor('health to report the database up', async () => (await health(baseUrl)).database === 'ok', 30_000, 250);
    const healthyAfterMs = Date.now() - upAt;
    await sleep(1500);
    p.stopPublishing();
    await p.settle(90_000);
    const settledAfterMs = Date.now() - upAt;

    const stored = await storedInstants(f.ds, f.probe.probeId);
    const ackedLost = [...p.ackedAt].filter((at) => stored.get(at) !== VALUES_PER_MESSAGE);
    const lost = p.sentAt.filter((at) => stored.get(at) !== VALUES_PER_MESSAGE);
    const rows = [...stored.values()].reduce((a, b) => a + b, 0);
    report(`PostgreSQL down ${OUTAGE_MS / 1000} s`, {
      sent: p.stats.sent,
      acked: p.stats.acked,
      ackedBeforeOutage: ackedBefore,
      ackedDuringOutage,
      stored: stored.size,
      duplicates: rows - stored.size * VALUES_PER_MESSAGE,
      lost: lost.length,
      ackedLost: ackedLost.length,
      refusedConnections: p.stats.closes,
      republished: p.stats.republished,
      healthChecksDown: healthDuring.filter((h) => h.status === 503 && h.database === 'down').length,
      healthChecks: healthDuring.length,
      slowestHealthMs: Math.max(...healthDuring.map((h) => h.elapsedMs)),
      healthyAfterMs,
      settledAfterMs,
      seconds: ((Date.now() - started) / 1000).toFixed(1),
    });

    // The same process all along: it neither crashed nor was restarted.
    expect(server!.alive()).toBe(true);
    expect(server!.pid).toBe(pid);
    // Refusing, not acknowledging, while the database was away.
    expect(ackedAtEndOfOutage).toBe(ackedAtStartOfOutage);
    expect(ackedDuringOutage).toBe(0);
    // Health answered promptly throughout and said the database was down.
    expect(healthDuring.every((h) => h.status === 503 && h.database === 'down')).toBe(true);
    expect(Math.max(...healthDuring.map((h) => h.elapsedMs))).toBeLessThan(3000);
    expect(healthy).toBe(true);
    // Nothing acknowledged is lost, and in the end nothing sent is lost either.
    expect(ackedLost).toEqual([]);
    expect(lost).toEqual([]);
    expect(rows).toBe(p.stats.sent * VALUES_PER_MESSAGE);
  });
});
