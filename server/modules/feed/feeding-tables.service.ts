import { defaultFeedRule, FEED_RULE_VERSION, feedRuleSources, mergeFeedRule, type FeedRule } from '../../../shared/feed';
import { feedRuleOverridesFrom, type FeedRulePatch, type PatchFeedingTable } from '../../../shared/schemas/feed.schema';
import type { FeedingTable, FeedingTableRow } from '../../db/entities';
import { badRequest, notFound } from '../../http/errors';
import type { Queues } from '../../queues';
import type { AuditRecorder, FarmDirectory } from '../stock/stock.service';
import type { FeedRepository } from './feed.repository';

/** Feeding tables per species and the farm's feed rule (defaults with the farm's overrides). */
export class FeedingTablesService {
  constructor(
    private readonly repo: FeedRepository,
    private readonly farms: FarmDirectory,
    private readonly queues: Queues,
    private readonly audit: AuditRecorder,
  ) {}

  async list(farmId: string): Promise<FeedingTable[]> {
    await this.farms.timeZone(farmId);
    return this.repo.tablesOfFarm(farmId);
  }

  forSpecies(farmId: string, species: string): Promise<FeedingTable | null> {
    return this.repo.tableForSpecies(farmId, species);
  }

  /** Changes a table (rows replace the stored rows), audited with before and after; today's rations are recomputed. */
  async patch(farmId: string, tableId: string, patch: PatchFeedingTable, actorId: string | null): Promise<FeedingTable> {
    const table = await this.repo.findTable(farmId, tableId);
    if (!table) throw notFound('Feeding table');
    const before = snapshot(table);
    if (patch.rows) {
      const overlaps = findOverlap(patch.rows);
      if (overlaps) throw badRequest(overlaps, { fieldErrors: { rows: [overlaps] } }, 'validation_failed');
      table.rows = patch.rows as FeedingTableRow[];
    }
    if (patch.name !== undefined) table.name = patch.name;
    if (patch.source !== undefined) table.source = patch.source;
    if (patch.maxKgPerHaPerDay !== undefined) table.maxKgPerHaPerDay = patch.maxKgPerHaPerDay;
    const after = snapshot(table);
    if (JSON.stringify(before) === JSON.stringify(after)) return table;
    const saved = await this.repo.saveTable(table);
    await this.audit.record({ farmId, actorId, action: 'feeding_table.updated', entity: 'feeding_table', entityId: table.id, before, after: { ...after, reason: patch.reason ?? null } });
    await this.queues.add('recommendFeed', { farmId }, { deduplication: { id: `feed-farm:${farmId}`, keepLastIfActive: true } });
    return saved;
  }

  async rule(farmId: string): Promise<{ version: string; rule: FeedRule; defaults: FeedRule; overrides: FeedRulePatch }> {
    // The overrides live under the farm settings' `feedRule` key (the farms module passes unknown keys through).
    const overrides = feedRuleOverridesFrom(await this.farms.getSettings(farmId));
    return { version: FEED_RULE_VERSION, rule: mergeFeedRule(overrides), defaults: defaultFeedRule, overrides };
  }

  /** Replaces the farm's rule overrides (audited); today's rations are recomputed. */
  async setRule(farmId: string, overrides: FeedRulePatch, reason: string | undefined, actorId: string | null) {
    const current = await this.rule(farmId);
    if (JSON.stringify(current.overrides) === JSON.stringify(overrides)) return current;
    await this.repo.setFeedRuleOverrides(farmId, overrides as Record<string, unknown>);
    await this.audit.record({ farmId, actorId, action: 'feed_rule.updated', entity: 'farm', entityId: farmId, before: { feedRule: current.overrides }, after: { feedRule: overrides, reason: reason ?? null } });
    await this.queues.add('recommendFeed', { farmId }, { deduplication: { id: `feed-farm:${farmId}`, keepLastIfActive: true } });
    return this.rule(farmId);
  }

  sources(): Record<string, string> {
    return { ...feedRuleSources };
  }
}

/** Two rows may not both cover one temperature and weight. */
function findOverlap(rows: PatchFeedingTable['rows'] & object): string | null {
  for (let i = 0; i < rows.length; i++) {
    for (let j = i + 1; j < rows.length; j++) {
      const a = rows[i]!;
      const b = rows[j]!;
      const t = a.minTemperatureC < b.maxTemperatureC && b.minTemperatureC < a.maxTemperatureC;
      const w = a.minWeightG < b.maxWeightG && b.minWeightG < a.maxWeightG;
      if (t && w) return `Rows ${i + 1} and ${j + 1} overlap: a temperature and weight would match both`;
    }
  }
  return null;
}

function snapshot(t: FeedingTable): Record<string, unknown> {
  return { name: t.name, source: t.source, maxKgPerHaPerDay: t.maxKgPerHaPerDay, rows: t.rows };
}
