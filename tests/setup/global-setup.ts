// Vitest global setup: a throwaway PostgreSQL (fsync off) and Redis on free ports, a template
// database with every migration applied, and an in-process SMTP fake. Nothing is shared with the
// demo stack (`npm start`): other ports, other data, so both can run at once.
//
// Tests read the addresses with inject(); see tests/setup/provided.d.ts, and use
// tests/setup/test-db.ts to get a database of their own cloned from the template.
import { chmodSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import type { ProvidedContext } from 'vitest';
import type { TestProject } from 'vitest/node';
import { freePort } from '../../scripts/stack/ports.mjs';
import { createDatabase, startPostgres, stopPostgres, type PostgresHandle } from '../../scripts/stack/postgres.mjs';
import { startRedis, stopRedis, type RedisHandle } from '../../scripts/stack/redis.mjs';
import { startSmtpFake } from '../../scripts/stack/smtp-fake.mjs';

export const TEMPLATE_DB = 'gw_template';
/** Temp folders live under /var/tmp, which the postgres user can traverse (unlike a mode-700 clone). */
const TEMP_BASE = '/var/tmp';
const TEMP_PREFIX = 'gillwise-test-';

interface TestStack {
  provided: Pick<ProvidedContext, 'pgAdminUrl' | 'templateDb' | 'redisUrl' | 'smtpPort' | 'mailApiUrl'>;
  users: number;
  teardown: () => Promise<void>;
}

// One stack per vitest process, even when several projects list this file as their globalSetup
// (each project loads it as a separate module instance, so the state lives on globalThis).
const STATE = Symbol.for('gillwise.test-stack');
type Holder = { [STATE]?: Promise<TestStack> };
const holder = globalThis as Holder;

function log(message: string): void {
  if (process.env.GILLWISE_TEST_STACK_QUIET !== '1') process.stdout.write(`[test-stack] ${message}\n`);
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function readPid(file: string): number | undefined {
  try {
    const pid = Number.parseInt(readFileSync(file, 'utf8').split('\n')[0] ?? '', 10);
    return Number.isInteger(pid) && pid > 0 ? pid : undefined;
  } catch {
    return undefined;
  }
}

function killQuietly(pid: number | undefined, signal: NodeJS.Signals): void {
  if (pid === undefined) return;
  try {
    process.kill(pid, signal);
  } catch {
    // already gone
  }
}

/** Remove stacks left by test runs that were killed before their teardown (their owner is dead). */
function collectAbandoned(): void {
  let names: string[];
  try {
    names = readdirSync(TEMP_BASE).filter((n) => n.startsWith(TEMP_PREFIX));
  } catch {
    return;
  }
  for (const name of names) {
    const dir = path.join(TEMP_BASE, name);
    const owner = readPid(path.join(dir, 'owner.pid'));
    if (owner !== undefined ? isAlive(owner) : Date.now() - statSync(dir).mtimeMs < 120_000) continue;
    killQuietly(readPid(path.join(dir, 'pg', 'postmaster.pid')), 'SIGQUIT');
    killQuietly(readPid(path.join(dir, 'redis', 'redis.pid')), 'SIGKILL');
    rmSync(dir, { recursive: true, force: true });
  }
}

async function withFreePort<T>(start: (port: number) => Promise<T>): Promise<T> {
  // freePort() can race with another process grabbing the port; try a few.
  for (let attempt = 1; ; attempt++) {
    try {
      return await start(await freePort());
    } catch (err) {
      if (attempt >= 3) throw err;
    }
  }
}

async function loadRunMigrations(): Promise<(databaseUrl: string) => Promise<unknown>> {
  let mod: { runMigrations?: unknown };
  try {
    mod = (await import('../../server/db/migrate')) as { runMigrations?: unknown };
  } catch (err) {
    throw new Error(
      `tests/setup/global-setup.ts: cannot import runMigrations from server/db/migrate.ts: ${(err as Error).message}`,
      { cause: err },
    );
  }
  if (typeof mod.runMigrations !== 'function') {
    throw new Error('tests/setup/global-setup.ts: server/db/migrate.ts does not export runMigrations(databaseUrl)');
  }
  return mod.runMigrations as (databaseUrl: string) => Promise<unknown>;
}

/** Close stray sessions on the template and make it a connection-less template, so clones never fail. */
async function sealTemplate(adminUrl: string): Promise<void> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    await client.query(`ALTER DATABASE "${TEMPLATE_DB}" WITH IS_TEMPLATE true ALLOW_CONNECTIONS false`);
    await client.query('SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = $1 AND pid <> pg_backend_pid()', [
      TEMPLATE_DB,
    ]);
  } finally {
    await client.end();
  }
}

async function startStack(): Promise<TestStack> {
  const startedAt = Date.now();
  collectAbandoned();
  const dir = mkdtempSync(path.join(TEMP_BASE, TEMP_PREFIX));
  chmodSync(dir, 0o755);
  writeFileSync(path.join(dir, 'owner.pid'), `${process.pid}\n`);
  const pgDir = path.join(dir, 'pg');
  const redisDir = path.join(dir, 'redis');

  let pgHandle: PostgresHandle | undefined;
  let redisHandle: RedisHandle | undefined;
  let mail: Awaited<ReturnType<typeof startSmtpFake>> | undefined;
  let tornDown = false;

  // Last resort when vitest exits without calling the teardown (e.g. an uncaught error).
  const onExit = (): void => {
    if (tornDown) return;
    killQuietly(readPid(path.join(pgDir, 'postmaster.pid')), 'SIGQUIT');
    killQuietly(readPid(path.join(redisDir, 'redis.pid')), 'SIGKILL');
    rmSync(dir, { recursive: true, force: true });
  };
  process.once('exit', onExit);

  const teardown = async (): Promise<void> => {
    if (tornDown) return;
    await mail?.close().catch(() => undefined);
    await stopRedis({ dir: redisDir }).catch(() => undefined);
    await stopPostgres({ dataDir: pgDir, mode: 'immediate' }).catch(() => undefined);
    tornDown = true;
    process.off('exit', onExit);
    rmSync(dir, { recursive: true, force: true });
  };

  try {
    const [pgStarted, redisStarted, mailStarted] = await Promise.all([
      withFreePort((port) => startPostgres({ dataDir: pgDir, port, fsyncOff: true, maxConnections: 300 })),
      withFreePort((port) => startRedis({ dir: redisDir, port, appendOnly: false })),
      startSmtpFake({ smtpPort: 0, apiPort: 0, keep: 5000 }),
    ]);
    pgHandle = pgStarted;
    redisHandle = redisStarted;
    mail = mailStarted;

    await createDatabase(pgHandle.adminUrl, TEMPLATE_DB);
    const templateUrl = new URL(pgHandle.adminUrl);
    templateUrl.pathname = `/${TEMPLATE_DB}`;
    const runMigrations = await loadRunMigrations();
    await runMigrations(templateUrl.toString());
    await sealTemplate(pgHandle.adminUrl);
  } catch (err) {
    await teardown();
    throw err;
  }

  log(
    `PostgreSQL 127.0.0.1:${pgHandle.port}, Redis 127.0.0.1:${redisHandle.port}, SMTP 127.0.0.1:${mail.smtpPort}, ` +
      `mail API ${mail.apiUrl}; data in ${dir} (${Date.now() - startedAt} ms)`,
  );
  return {
    provided: {
      pgAdminUrl: pgHandle.adminUrl,
      templateDb: TEMPLATE_DB,
      redisUrl: redisHandle.url,
      smtpPort: mail.smtpPort,
      mailApiUrl: mail.apiUrl,
    },
    users: 0,
    teardown,
  };
}

export default async function setup({ provide }: TestProject): Promise<() => Promise<void>> {
  holder[STATE] ??= startStack();
  let stack: TestStack;
  try {
    stack = await holder[STATE];
  } catch (err) {
    delete holder[STATE];
    throw err;
  }
  stack.users++;
  provide('pgAdminUrl', stack.provided.pgAdminUrl);
  provide('templateDb', stack.provided.templateDb);
  provide('redisUrl', stack.provided.redisUrl);
  provide('smtpPort', stack.provided.smtpPort);
  provide('mailApiUrl', stack.provided.mailApiUrl);

  return async () => {
    stack.users--;
    if (stack.users > 0) return;
    delete holder[STATE];
    await stack.teardown();
  };
}
