import type { DataSource } from 'typeorm';
import { ExportsRepository } from './exports.repository';
import { ExportsService } from './exports.service';

/** Builds the CSV exports for the composition root (server/container.ts) in one line. */
export const createExportsService = (ds: DataSource): ExportsService => new ExportsService(new ExportsRepository(ds));
