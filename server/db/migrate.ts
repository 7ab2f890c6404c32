import { pathToFileURL } from 'node:url';
import { createDataSource } from './data-source';

/** Applies every pending migration in one transaction. */
export async function runMigrations(databaseUrl: string): Promise<string[]> {
  const ds = createDataSource(databaseUrl, { poolSize: 2 });
  await ds.initialize();
  try {
    const done = await ds.runMigrations({ transaction: 'all' });
    return done.map((m) => m.name);
  } finally {
    await ds.destroy();
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const { env } = await import('../config/env');
  const applied = await runMigrations(env().DATABASE_URL);
  process.stdout.write(applied.length ? `migrations applied: ${applied.join(', ')}\n` : 'schema up to date\n');
}
