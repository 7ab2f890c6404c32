import { Between, In, LessThanOrEqual, Not, type DataSource } from 'typeorm';
import {
  Alert,
  CultureUnit,
  FeedingRecord,
  FeedingTable,
  FeedRecommendation,
  FlowMeasurement,
  Probe,
  ThresholdProfile,
} from '../../db/entities';

export type ReadingPoint = { at: Date; value: number };

/** The proposal part of a recommendation: what the rule computes, before anyone decides. */
export type ProposalRow = Pick<
  FeedRecommendation,
  'biomassKg' | 'plannedKg' | 'plannedPctBw' | 'action' | 'cutPct' | 'recommendedKg' | 'reasons' | 'inputs' | 'ruleVersion' | 'computedAt'
>;

export class FeedRepository {
  constructor(private readonly ds: DataSource) {}

  /** The farm's units as entities, in walk order (the units service lists presented units). */
  unitsOfFarm(farmId: string): Promise<CultureUnit[]> {
    return this.ds.getRepository(CultureUnit).find({ where: { farmId }, order: { walkOrder: 'ASC', code: 'ASC' } });
  }

  // --- feeding tables and the farm's rule overrides ---
  tablesOfFarm(farmId: string): Promise<FeedingTable[]> {
    return this.ds.getRepository(FeedingTable).find({ where: { farmId }, order: { species: 'ASC', name: 'ASC' } });
  }
  tableForSpecies(farmId: string, species: string): Promise<FeedingTable | null> {
    return this.ds.getRepository(FeedingTable).findOne({ where: { farmId, species }, order: { name: 'ASC' } });
  }
  findTable(farmId: string, tableId: string): Promise<FeedingTable | null> {
    return this.ds.getRepository(FeedingTable).findOneBy({ id: tableId, farmId });
  }
  saveTable(t: FeedingTable): Promise<FeedingTable> {
    return this.ds.getRepository(FeedingTable).save(t);
  }
  /** Writes only the farm settings' `feedRule` key, leaving every other setting as it is. */
  async setFeedRuleOverrides(farmId: string, overrides: Record<string, unknown>): Promise<void> {
    await this.ds.query(`UPDATE farms SET settings = jsonb_set(COALESCE(settings, '{}'::jsonb), '{feedRule}', $2::jsonb, true), updated_at = now() WHERE id = $1`, [
      farmId,
      JSON.stringify(overrides),
    ]);
  }
  findProfile(profileId: string): Promise<ThresholdProfile | null> {
    return this.ds.getRepository(ThresholdProfile).findOneBy({ id: profileId });
  }

  // --- probe readings, flow and alerts (read-only; until the readings, units and alerts services offer these) ---
  async probeIdsOfUnit(unitId: string): Promise<string[]> {
    return (await this.ds.getRepository(Probe).find({ where: { unitId }, select: { id: true } })).map((p) => p.id);
  }
  async meanReading(probeIds: string[], quantity: string, from: Date, to: Date): Promise<{ mean: number; n: number; first: Date; last: Date } | null> {
    if (!probeIds.length) return null;
    const rows = (await this.ds.query(
      `SELECT avg(value) AS mean, count(*)::int AS n, min(at) AS first, max(at) AS last FROM readings
       WHERE probe_id = ANY($1::uuid[]) AND quantity = $2 AND quality = 'good' AND at > $3 AND at <= $4`,
      [probeIds, quantity, from.toISOString(), to.toISOString()],
    )) as Array<{ mean: string | number | null; n: number; first: Date | string | null; last: Date | string | null }>;
    const r = rows[0];
    if (!r || !r.n || r.mean === null || !r.first || !r.last) return null;
    return { mean: Number(r.mean), n: Number(r.n), first: new Date(r.first), last: new Date(r.last) };
  }
  async latestReading(probeIds: string[], quantity: string, from: Date, to: Date): Promise<ReadingPoint | null> {
    if (!probeIds.length) return null;
    const rows = (await this.ds.query(
      `SELECT at, value FROM readings WHERE probe_id = ANY($1::uuid[]) AND quantity = $2 AND quality = 'good' AND at > $3 AND at <= $4
       ORDER BY at DESC LIMIT 1`,
      [probeIds, quantity, from.toISOString(), to.toISOString()],
    )) as Array<{ at: Date | string; value: string | number }>;
    return rows[0] ? { at: new Date(rows[0].at), value: Number(rows[0].value) } : null;
  }
  async lowestReading(probeIds: string[], quantity: string, from: Date, to: Date): Promise<ReadingPoint | null> {
    if (!probeIds.length) return null;
    const rows = (await this.ds.query(
      `SELECT at, value FROM readings WHERE probe_id = ANY($1::uuid[]) AND quantity = $2 AND quality = 'good' AND at >= $3 AND at <= $4
       ORDER BY value ASC, at ASC LIMIT 1`,
      [probeIds, quantity, from.toISOString(), to.toISOString()],
    )) as Array<{ at: Date | string; value: string | number }>;
    return rows[0] ? { at: new Date(rows[0].at), value: Number(rows[0].value) } : null;
  }
  latestFlowMeasurement(unitId: string, to: Date, source?: 'manual' | 'design'): Promise<FlowMeasurement | null> {
    return this.ds.getRepository(FlowMeasurement).findOne({
      where: { unitId, measuredAt: LessThanOrEqual(to), ...(source ? { source } : {}) },
      order: { measuredAt: 'DESC' },
    });
  }
  openAlerts(unitId: string, kinds: string[]): Promise<Alert[]> {
    if (!kinds.length) return Promise.resolve([]);
    return this.ds.getRepository(Alert).find({ where: { unitId, kind: In(kinds), state: Not('resolved') }, order: { openedAt: 'DESC' } });
  }

  // --- recommendations ---
  findRecommendation(farmId: string, id: string): Promise<FeedRecommendation | null> {
    return this.ds.getRepository(FeedRecommendation).findOneBy({ id, farmId });
  }
  recommendationOf(unitId: string, day: string): Promise<FeedRecommendation | null> {
    return this.ds.getRepository(FeedRecommendation).findOneBy({ unitId, day });
  }
  recommendationsOfDay(farmId: string, day: string): Promise<FeedRecommendation[]> {
    return this.ds.getRepository(FeedRecommendation).findBy({ farmId, day });
  }
  saveRecommendation(r: FeedRecommendation): Promise<FeedRecommendation> {
    return this.ds.getRepository(FeedRecommendation).save(r);
  }

  /**
   * Stores the day's proposal for a unit, once per (unit, day). A pending recommendation takes the new
   * proposal; a decided one keeps its decision and its proposal, and the new proposal is appended to
   * `inputs.laterProposals` (the last 10 are kept) — when `note` says it differs.
   */
  async upsertProposal(
    key: { farmId: string; unitId: string; day: string },
    proposal: ProposalRow,
    laterNote: (existing: FeedRecommendation) => Record<string, unknown> | null,
  ): Promise<{ row: FeedRecommendation; outcome: 'created' | 'updated' | 'kept_decision' }> {
    return this.ds.transaction(async (m) => {
      const inserted = await m
        .createQueryBuilder()
        .insert()
        .into(FeedRecommendation)
        .values({ ...key, ...proposal, status: 'pending' } as never)
        .orIgnore()
        .returning(['id'])
        .execute();
      const created = Array.isArray(inserted.raw) && inserted.raw.length > 0;
      const row = await m.getRepository(FeedRecommendation).findOne({ where: { unitId: key.unitId, day: key.day }, lock: { mode: 'pessimistic_write' } });
      if (!row) throw new Error('recommendation vanished after upsert');
      if (created) return { row, outcome: 'created' as const };
      if (row.status === 'pending') {
        Object.assign(row, proposal);
        return { row: await m.save(row), outcome: 'updated' as const };
      }
      const later = laterNote(row);
      if (later) {
        const list = Array.isArray(row.inputs.laterProposals) ? (row.inputs.laterProposals as unknown[]) : [];
        row.inputs = { ...row.inputs, laterProposals: [...list, later].slice(-10) };
        await m.save(row);
      }
      return { row, outcome: 'kept_decision' as const };
    });
  }

  // --- what was fed ---
  findFeeding(unitId: string, day: string): Promise<FeedingRecord | null> {
    return this.ds.getRepository(FeedingRecord).findOne({ where: { unitId, day }, order: { createdAt: 'DESC' } });
  }
  saveFeeding(f: Partial<FeedingRecord>): Promise<FeedingRecord> {
    return this.ds.getRepository(FeedingRecord).save(this.ds.getRepository(FeedingRecord).create(f));
  }
  feedingsOfDay(farmId: string, day: string): Promise<FeedingRecord[]> {
    return this.ds.getRepository(FeedingRecord).find({ where: { farmId, day }, order: { createdAt: 'ASC' } });
  }
  feedingsOfUnit(unitId: string, from: string, to: string): Promise<FeedingRecord[]> {
    return this.ds.getRepository(FeedingRecord).find({ where: { unitId, day: Between(from, to) }, order: { day: 'ASC', createdAt: 'ASC' } });
  }
  feedingsBetween(unitId: string, from: Date, to: Date): Promise<FeedingRecord[]> {
    return this.ds.getRepository(FeedingRecord).find({ where: { unitId, fedAt: Between(from, to) }, order: { fedAt: 'ASC' } });
  }
}
