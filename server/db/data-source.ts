import 'reflect-metadata';
import { DataSource } from 'typeorm';
import * as entities from './entities';
import { migrations } from './migrations';

/** A DataSource for one database URL. synchronize is never on: the schema comes from migrations. */
export function createDataSource(databaseUrl: string, options: { poolSize?: number } = {}): DataSource {
  return new DataSource({
    type: 'postgres',
    url: databaseUrl,
    entities: Object.values(entities).filter((e) => typeof e === 'function'),
    migrations,
    synchronize: false,
    migrationsRun: false,
    logging: false,
    uuidExtension: 'pgcrypto',
    extra: { max: options.poolSize ?? 10 },
  });
}

// The TypeORM CLI (migration:generate) loads this module's default export.
export default createDataSource(process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54329/gillwise');
