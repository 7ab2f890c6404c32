// A PostgreSQL cluster or Redis server of one fault test's own, in a temp folder under /var/tmp (the
// postgres user can traverse it), so stopping it never touches the shared test stack that other test
// files use at the same time.
import { chmodSync, mkdtempSync, rmSync } from 'node:fs';
import path from 'node:path';
import { freePort } from '../../../scripts/stack/ports.mjs';
import { createDatabase, startPostgres, stopPostgres, type PostgresHandle } from '../../../scripts/stack/postgres.mjs';
import { startRedis, stopRedis, runningRedis, type RedisHandle } from '../../../scripts/stack/redis.mjs';
import { runMigrations } from '../../../server/db/migrate';

function tempDir(kind: string): string {
  const dir = mkdtempSync(path.join('/var/tmp', `gillwise-faults-${kind}-`));
  chmodSync(dir, 0o755);
  return dir;
}

export type DedicatedPostgres = {
  databaseUrl: string;
  port: number;
  /** Fast shutdown: every session is disconnected, as when the database host goes away. */
  stop(): Promise<void>;
  /** Starts the same cluster again on the same port. */
  start(): Promise<void>;
  destroy(): Promise<void>;
};

/** A fresh cluster with one migrated database `gillwise`. */
export async function startDedicatedPostgres(): Promise<DedicatedPostgres> {
  const dir = tempDir('pg');
  const dataDir = path.join(dir, 'pg');
  let handle: PostgresHandle | undefined;
  for (let attempt = 1; !handle; attempt++) {
    try {
      handle = await startPostgres({ dataDir, port: await freePort(), fsyncOff: true, maxConnections: 100 });
    } catch (err) {
      if (attempt >= 3) {
        rmSync(dir, { recursive: true, force: true });
        throw err;
      }
    }
  }
  const port = handle.port;
  await createDatabase(handle.adminUrl, 'gillwise');
  const databaseUrl = `postgres://postgres@127.0.0.1:${port}/gillwise`;
  await runMigrations(databaseUrl);
  return {
    databaseUrl,
    port,
    async stop() {
      await stopPostgres({ dataDir, mode: 'fast' });
    },
    async start() {
      await startPostgres({ dataDir, port, fsyncOff: true, maxConnections: 100 });
    },
    async destroy() {
      await stopPostgres({ dataDir, mode: 'immediate' }).catch(() => undefined);
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export type DedicatedRedis = {
  url: string;
  port: number;
  dir: string;
  pid(): number | undefined;
  /** SIGTERM: redis writes and fsyncs the append-only file, then exits. */
  stop(): Promise<void>;
  /** SIGKILL: nothing is flushed; with appendfsync everysec up to about a second of writes may be lost. */
  kill(): Promise<void>;
  start(): Promise<void>;
  destroy(): Promise<void>;
};

/** redis-server with appendonly yes and appendfsync everysec, as the demo stack runs it (scripts/stack/redis.mjs). */
export async function startDedicatedRedis(): Promise<DedicatedRedis> {
  const dir = tempDir('redis');
  let handle: RedisHandle | undefined;
  for (let attempt = 1; !handle; attempt++) {
    try {
      handle = await startRedis({ dir, port: await freePort(), appendOnly: true });
    } catch (err) {
      if (attempt >= 3) {
        rmSync(dir, { recursive: true, force: true });
        throw err;
      }
    }
  }
  const port = handle.port;
  const pid = () => runningRedis(dir)?.pid;
  const waitGone = async (p: number) => {
    for (let i = 0; i < 200; i++) {
      try {
        process.kill(p, 0);
      } catch {
        return;
      }
      await new Promise((r) => setTimeout(r, 25));
    }
    throw new Error(`redis ${p} did not exit`);
  };
  return {
    url: handle.url,
    port,
    dir,
    pid,
    async stop() {
      await stopRedis({ dir });
    },
    async kill() {
      const p = pid();
      if (!p) return;
      process.kill(p, 'SIGKILL');
      await waitGone(p);
    },
    async start() {
      await startRedis({ dir, port, appendOnly: true });
    },
    async destroy() {
      const p = pid();
      if (p) {
        try {
          process.kill(p, 'SIGKILL');
        } catch {
          // gone
        }
        await waitGone(p).catch(() => undefined);
      }
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
