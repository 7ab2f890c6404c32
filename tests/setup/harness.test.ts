import pg from 'pg';
import { inject, describe, expect, it } from 'vitest';
import { redisCommand } from '../../scripts/stack/redis.mjs';
import { createTestDatabase, uniqueQueuePrefix } from './test-db';

async function query<T extends pg.QueryResultRow>(databaseUrl: string, sql: string): Promise<T[]> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    return (await client.query<T>(sql)).rows;
  } finally {
    await client.end();
  }
}

describe('test harness', () => {
  it('is wired in: this project lists tests/setup/global-setup.ts as its globalSetup', () => {
    expect(inject('pgAdminUrl'), 'add tests/setup/global-setup.ts to globalSetup in vitest.config.ts').toMatch(/^postgres:\/\//);
  });

  it('gives each caller its own database with the migrated schema, even when asked concurrently', async () => {
    const dbs = await Promise.all([createTestDatabase(), createTestDatabase(), createTestDatabase()]);
    expect(new Set(dbs.map((d) => d.name)).size).toBe(3);
    for (const db of dbs) {
      expect(db.name).toMatch(/^gw_t_[0-9a-f]{12}$/);
      const tables = await query<{ n: string }>(
        db.databaseUrl,
        "SELECT count(*)::text AS n FROM information_schema.tables WHERE table_schema = 'public'",
      );
      expect(Number(tables[0]?.n)).toBeGreaterThan(0);
    }
    await Promise.all(dbs.map((d) => d.drop()));
    const left = await query<{ datname: string }>(
      inject('pgAdminUrl'),
      `SELECT datname FROM pg_database WHERE datname IN (${dbs.map((d) => `'${d.name}'`).join(',')})`,
    );
    expect(left).toEqual([]);
  });

  it('runs a throwaway PostgreSQL without fsync and a Redis of its own', async () => {
    const [settings] = await query<{ fsync: string }>(inject('pgAdminUrl'), "SELECT current_setting('fsync') AS fsync");
    expect(settings?.fsync).toBe('off');
    expect(await redisCommand(Number(new URL(inject('redisUrl')).port), 'PING')).toBe('+PONG');
    expect(uniqueQueuePrefix()).not.toBe(uniqueQueuePrefix());
  });
});
