import type { DataSource } from 'typeorm';
import { RecordsRepository } from './records.repository';
import { RecordsService } from './records.service';

/** Builds the inspection records for the composition root (server/container.ts) in one line. */
export const createRecordsService = (ds: DataSource): RecordsService => new RecordsService(new RecordsRepository(ds));
