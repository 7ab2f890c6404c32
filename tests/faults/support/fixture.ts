// What every fault test needs: a database cloned from the migrated template (or a dedicated one),
// the demo farms, one probe, and the environment for server/worker child processes.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { DataSource } from 'typeorm';
import { createDataSource } from '../../../server/db/data-source';
import type { SeedResult } from '../../../server/db/seed/seed';
import { DEMO_PASSWORD, seedDemoFarms } from '../../factories/demo';
import { createProbe } from '../../factories/probes';
import { uniqueQueuePrefix } from '../../setup/test-db';
import { testEnvSource } from '../../setup/test-env';

export type FaultFixture = {
  ds: DataSource;
  seed: SeedResult;
  farmId: string;
  unitId: string;
  probe: { probeId: string; probeKey: string; secret: string };
  queuePrefix: string;
  /** Environment for server/index.ts and worker/index.ts (ports are added by startServerProcess). */
  env: Record<string, string | undefined>;
  close(): Promise<void>;
};

export async function faultFixture(opts: { databaseUrl: string; redisUrl?: string; env?: Record<string, string> }): Promise<FaultFixture> {
  const ds = createDataSource(opts.databaseUrl, { poolSize: 4 });
  await ds.initialize();
  const seed = await seedDemoFarms(ds);
  const farmId = seed.farms['harrow-bend']!;
  const unitId = seed.units['harrow-bend:P1']!;
  const probe = await createProbe(ds, farmId, unitId, ['dissolved_oxygen', 'water_temperature', 'ph']);
  const queuePrefix = uniqueQueuePrefix();
  const dataDir = mkdtempSync(path.join(tmpdir(), 'gillwise-faults-data-'));
  const env = testEnvSource({
    databaseUrl: opts.databaseUrl,
    queuePrefix,
    LOG_LEVEL: 'info',
    DATA_DIR: dataDir,
    // API and broker only: no built client to serve.
    CLIENT_DIST_DIR: path.join(dataDir, 'no-client'),
    INGEST_FLUSH_MS: '20',
    ...(opts.redisUrl ? { REDIS_URL: opts.redisUrl } : {}),
    ...opts.env,
  });
  return {
    ds,
    seed,
    farmId,
    unitId,
    probe,
    queuePrefix,
    env,
    async close() {
      await ds.destroy().catch(() => undefined);
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** Readings stored for a probe, by sample instant (ms) → number of rows at that instant. */
export async function storedInstants(ds: DataSource, probeId: string): Promise<Map<number, number>> {
  const rows = (await ds.query('SELECT extract(epoch FROM at) * 1000 AS ms, count(*)::int AS n FROM readings WHERE probe_id = $1 GROUP BY at', [
    probeId,
  ])) as Array<{ ms: string | number; n: number }>;
  return new Map(rows.map((r) => [Math.round(Number(r.ms)), r.n]));
}

export async function countRows(ds: DataSource, sql: string, params: unknown[] = []): Promise<number> {
  const rows = (await ds.query(sql, params)) as Array<{ n: number | string }>;
  return Number(rows[0]?.n ?? 0);
}

/** One `[faults] …` line in the test output with the counts a reader checks. */
export function report(name: string, counts: Record<string, number | string>): void {
  const parts = Object.entries(counts).map(([k, v]) => `${k}=${v}`);
  console.log(`[faults] ${name}: ${parts.join(' ')}`);
}

/** Signs in to a server child process as a demo user and returns the session cookie. */
export async function signInTo(baseUrl: string, email: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers.getSetCookie().find((c) => c.startsWith('gw_session='));
  if (!cookie) throw new Error('no session cookie');
  return cookie.split(';')[0]!;
}

export type BrokerCounters = { messages: number; readingsStored: number; readingsDuplicate: number; rejects: Record<string, number>; writeFailures: number };

/** The broker counters of one server process (since it started), from GET /api/farms/:farmId/ingest. */
export async function brokerCounters(baseUrl: string, farmId: string, cookie: string): Promise<BrokerCounters> {
  const res = await fetch(`${baseUrl}/api/farms/${farmId}/ingest`, { headers: { cookie } });
  if (res.status !== 200) throw new Error(`GET ingest: ${res.status} ${await res.text()}`);
  const body = (await res.json()) as { broker: BrokerCounters | null };
  if (!body.broker) throw new Error('this server reports no broker');
  return body.broker;
}
