// Per-test databases cloned from the migrated template that tests/setup/global-setup.ts builds.
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { inject } from 'vitest';

export interface TestDatabase {
  /** gw_t_<random> */
  name: string;
  /** postgres://postgres@127.0.0.1:<port>/gw_t_<random> */
  databaseUrl: string;
  /** Drop the database, closing any sessions still open on it. Safe to call twice. */
  drop(): Promise<void>;
}

// Any number so unlikely to collide with the app's own advisory locks.
const CLONE_LOCK_KEY = 738_150_412;
const RETRY_MS = 20_000;

let cloneChain: Promise<unknown> = Promise.resolve();

function databaseUrlFor(adminUrl: string, name: string): string {
  const url = new URL(adminUrl);
  url.pathname = `/${name}`;
  return url.toString();
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function cloneTemplate(adminUrl: string, template: string, name: string): Promise<void> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    // Serialize clones across test workers too; PostgreSQL refuses to copy a template that anyone
    // is connected to (55006), which the retry covers should it still happen.
    await client.query('SELECT pg_advisory_lock($1)', [CLONE_LOCK_KEY]);
    const deadline = Date.now() + RETRY_MS;
    for (let attempt = 0; ; attempt++) {
      try {
        await client.query(`CREATE DATABASE "${name}" TEMPLATE "${template}"`);
        return;
      } catch (err) {
        if ((err as { code?: string }).code !== '55006' || Date.now() > deadline) throw err;
        await sleep(Math.min(25 * 2 ** attempt, 500));
      }
    }
  } finally {
    await client.query('SELECT pg_advisory_unlock($1)', [CLONE_LOCK_KEY]).catch(() => undefined);
    await client.end();
  }
}

/**
 * A fresh database with the full schema (a copy of the template), for one test file or test.
 * The whole test cluster is thrown away after the run, so drop() is optional housekeeping.
 */
export async function createTestDatabase(): Promise<TestDatabase> {
  const adminUrl = inject('pgAdminUrl');
  const template = inject('templateDb');
  const name = `gw_t_${randomBytes(6).toString('hex')}`;
  const clone = cloneChain.then(() => cloneTemplate(adminUrl, template, name));
  cloneChain = clone.catch(() => undefined);
  await clone;
  let dropped: Promise<void> | undefined;
  return {
    name,
    databaseUrl: databaseUrlFor(adminUrl, name),
    drop() {
      dropped ??= (async () => {
        const client = new pg.Client({ connectionString: adminUrl });
        await client.connect();
        try {
          await client.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
        } finally {
          await client.end();
        }
      })();
      return dropped;
    },
  };
}

/** A BullMQ prefix of its own, so queues of parallel tests never see each other's jobs. */
export function uniqueQueuePrefix(): string {
  return `gwt-${randomBytes(5).toString('hex')}`;
}
