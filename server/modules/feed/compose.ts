import type { DataSource } from 'typeorm';
import type { Logger } from '../../lib/logger';
import type { Queues } from '../../queues';
import type { LiveService } from '../live/live.service';
import { StockRepository } from '../stock/stock.repository';
import { StockService, type AuditRecorder, type FarmDirectory, type UnitDirectory, type WithdrawalCheck } from '../stock/stock.service';
import { FeedRepository } from './feed.repository';
import { FeedService, type AmmoniaResults, type RecentTreatments, type UnitFlows, type UnitObservations } from './feed.service';
import { FeedingTablesService } from './feeding-tables.service';
import { FeedingsService } from './feedings.service';

/**
 * Builds the stock and feed services for the composition root (server/container.ts), so the root
 * needs one line for both modules. The other modules come in through their services; the alerts
 * module's open alerts are installed later with `feed.useAlertSource(...)`.
 */
export function createStockAndFeedServices(d: {
  ds: DataSource;
  queues: Queues;
  live: LiveService;
  audit: AuditRecorder;
  logger: Logger;
  waterTests: AmmoniaResults;
  treatments: WithdrawalCheck & RecentTreatments;
  observations: UnitObservations;
  farms: FarmDirectory;
  units: UnitDirectory & UnitFlows;
}) {
  const feedRepo = new FeedRepository(d.ds);
  const feedings = new FeedingsService(feedRepo, d.farms, d.units, d.live, d.audit);
  const stock = new StockService(new StockRepository(d.ds), d.farms, d.units, feedings, d.treatments, d.queues, d.audit);
  const feedTables = new FeedingTablesService(feedRepo, d.farms, d.queues, d.audit);
  const feed = new FeedService(feedRepo, d.farms, d.units, stock, feedings, feedTables, d.waterTests, d.treatments, d.observations, d.live, d.audit, d.logger);
  return { stock, feedings, feedTables, feed };
}
