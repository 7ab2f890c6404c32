import { join } from 'node:path';
import type { Redis } from 'ioredis';
import type { DataSource } from 'typeorm';
import type { Env } from '../../config/env';
import type { Logger } from '../../lib/logger';
import type { Queues } from '../../queues';
import { ImportSessionStore } from './import-sessions.store';
import { ImportsRepository } from './imports.repository';
import { ImportsService, type ImportAudit } from './imports.service';

/** Builds the CSV importer for the composition root (server/container.ts) in one line. */
export function createImportsService(d: { ds: DataSource; redis: Redis; queues: Queues; audit: ImportAudit; logger: Logger; config: Env }): ImportsService {
  return new ImportsService(new ImportsRepository(d.ds), new ImportSessionStore(d.redis, d.config.QUEUE_PREFIX), d.queues, d.audit, d.logger, {
    uploadDir: join(d.config.DATA_DIR, 'uploads', 'imports'),
  });
}
