import { biomassAt, fcrPeriods, mergeFeedRule, stockTimeline, type BiomassEstimate, type FcrPeriod, type StockEventInput, type StockPoint } from '../../../shared/feed';
import { localDay } from '../../../shared/farm-time';
import { feedRuleOverridesFrom } from '../../../shared/schemas/feed.schema';
import type { CreateStockEvent } from '../../../shared/schemas/stock.schema';
import type { CultureUnit, FarmSettings, StockEvent } from '../../db/entities';
import { AppError, badRequest, conflict } from '../../http/errors';
import type { Queues } from '../../queues';
import type { StockRepository } from './stock.repository';

/** Where audit entries go (the audit module's service, or the interim sink of the composition root). */
export type AuditRecorder = {
  record(e: { farmId: string | null; actorId: string | null; action: string; entity: string; entityId: string | null; before: Record<string, unknown> | null; after: Record<string, unknown> | null }): Promise<unknown>;
};

/** The treatments module's answer to "is this unit in a withdrawal period?". */
export type WithdrawalCheck = {
  withdrawalStatus(farmId: string, unitId: string, at?: Date): Promise<{ inWithdrawal: boolean; endsAt: string | null; reason: string | null; treatmentId: string | null }>;
};

/** The farms module's settings and time zone of a farm (404 for an unknown farm). */
export type FarmDirectory = {
  getSettings(farmId: string): Promise<FarmSettings>;
  timeZone(farmId: string): Promise<string>;
};

/** The units module's check that a unit is on a farm (404 otherwise). */
export type UnitDirectory = { require(farmId: string, unitId: string): Promise<CultureUnit> };

/** What was fed between two instants (the feed module's feeding records). */
export type FeedLedger = {
  fedBetween(unitId: string, from: Date, to: Date): Promise<Array<{ fedAt: Date; fedKg: number }>>;
};

export type UnitEstimate = BiomassEstimate & {
  asOf: Date;
  unit: CultureUnit;
  stocked: boolean;
  densityKgPerM3: number | null;
  kgPerHa: number | null;
  ageWarning: string | null;
};

export type UnitStock = {
  unit: CultureUnit;
  current: UnitEstimate;
  history: Array<{ event: StockEvent; after: StockPoint }>;
  fcr: { periods: FcrPeriod[]; overall: FcrPeriod | null };
  notes: string[];
};

const REMOVALS = new Set(['mortality', 'harvest', 'transfer_out']);
const DAY = 86_400_000;

export const toStockInput = (e: StockEvent): StockEventInput => ({
  id: e.id,
  kind: e.kind,
  at: e.at.toISOString(),
  count: e.count,
  totalWeightKg: e.totalWeightKg,
  meanWeightG: e.meanWeightG,
  sampleSize: e.sampleSize,
  sampleSdG: e.sampleSdG,
  meanLengthCm: e.meanLengthCm,
});

export class StockService {
  constructor(
    private readonly repo: StockRepository,
    private readonly farms: FarmDirectory,
    private readonly units: UnitDirectory,
    private readonly feedLedger: FeedLedger,
    private readonly withdrawal: WithdrawalCheck,
    private readonly queues: Queues,
    private readonly audit: AuditRecorder,
  ) {}

  private unitOrThrow(farmId: string, unitId: string): Promise<CultureUnit> {
    return this.units.require(farmId, unitId);
  }

  private async unitOnFarm(farmId: string, unitId: string): Promise<CultureUnit | null> {
    try {
      return await this.units.require(farmId, unitId);
    } catch (err) {
      if (err instanceof AppError && err.status === 404) return null;
      throw err;
    }
  }

  private async staleDays(farmId: string): Promise<number> {
    return mergeFeedRule(feedRuleOverridesFrom(await this.farms.getSettings(farmId))).weightStaleDays;
  }

  /**
   * Records a stock event. A transfer out also creates the matching transfer in on the receiving unit
   * (same farm). Harvests and transfers out are refused while the unit is in a withdrawal period, and
   * no event may remove more fish than are on record.
   */
  async record(farmId: string, unitId: string, input: CreateStockEvent, actorId: string | null): Promise<{ event: StockEvent; related: StockEvent | null }> {
    const unit = await this.unitOrThrow(farmId, unitId);
    const at = input.at ? new Date(input.at) : new Date();
    let related: CultureUnit | null = null;
    if (input.kind === 'transfer_out') {
      related = input.relatedUnitId ? await this.unitOnFarm(farmId, input.relatedUnitId) : null;
      if (!related) throw badRequest('The receiving unit is not on this farm.', { fieldErrors: { relatedUnitId: ['not a unit of this farm'] } }, 'validation_failed');
      if (related.id === unit.id) throw badRequest('A transfer needs another unit.', { fieldErrors: { relatedUnitId: ['the same unit'] } }, 'validation_failed');
    }
    if (input.kind === 'harvest' || input.kind === 'transfer_out') {
      const w = await this.withdrawal.withdrawalStatus(farmId, unitId, at);
      if (w.inWithdrawal) {
        const timeZone = await this.farms.timeZone(farmId);
        const until = w.endsAt ? `until ${localDay(new Date(w.endsAt), timeZone)}` : 'until the logged temperatures reach its degree-days';
        const what = input.kind === 'harvest' ? 'Harvest' : 'Transfer';
        throw conflict(`${what} refused: ${unit.code} is in a withdrawal period ${until}. ${w.reason ?? ''}`.trim(), { withdrawal: w }, 'in_withdrawal');
      }
    }
    const events = await this.repo.listEvents(unitId);
    const before = biomassAt(events.map(toStockInput), at.toISOString());
    const n = input.count ?? 0;
    if (REMOVALS.has(input.kind) && n > before.count) {
      throw conflict(`Only ${before.count.toLocaleString('en-US')} fish are on record in ${unit.code} at that time; ${n.toLocaleString('en-US')} cannot leave it.`, { onRecord: before.count }, 'not_enough_fish');
    }
    const meanWeightG = (() => {
      if (input.meanWeightG != null) return input.meanWeightG;
      if (input.totalWeightKg != null) {
        const of = input.kind === 'sample_weighing' ? (input.sampleSize ?? 0) : n;
        if (of > 0) return (input.totalWeightKg * 1000) / of;
      }
      // Fish moved carry the weight the unit's estimate gives them, so the receiving unit knows it too.
      return input.kind === 'transfer_out' ? before.meanWeightG : null;
    })();
    const totalWeightKg =
      input.totalWeightKg ?? (meanWeightG !== null && input.kind !== 'sample_weighing' && input.kind !== 'mortality' && n > 0 ? (n * meanWeightG) / 1000 : null);
    const meanLengthCm = input.meanLengthCm ?? (input.kind === 'transfer_out' ? before.meanLengthCm : null);
    const row: Partial<StockEvent> = {
      farmId,
      unitId,
      kind: input.kind,
      at,
      count: input.kind === 'sample_weighing' ? (input.count ?? null) : n,
      totalWeightKg,
      meanWeightG,
      sampleSize: input.sampleSize ?? null,
      sampleSdG: input.sampleSdG ?? null,
      meanLengthCm,
      relatedUnitId: related?.id ?? null,
      note: input.note ?? null,
      createdById: actorId,
    };
    const rows: Array<Partial<StockEvent>> = [row];
    if (related) {
      rows.push({ ...row, unitId: related.id, kind: 'transfer_in', relatedUnitId: unit.id, sampleSize: null, sampleSdG: null });
    }
    const [event, inEvent] = await this.repo.insertEvents(rows);
    if (!event) throw new Error('stock event not stored');
    await this.audit.record({ farmId, actorId, action: 'stock_event.recorded', entity: 'stock_event', entityId: event.id, before: null, after: snapshot(event) });
    for (const id of [unitId, related?.id].filter((x): x is string => Boolean(x))) {
      await this.queues.add('recommendFeed', { farmId, unitId: id }, { deduplication: { id: `feed:${id}`, keepLastIfActive: true } });
    }
    return { event, related: inEvent ?? null };
  }

  async list(farmId: string, unitId: string, q: { from?: string | undefined; to?: string | undefined; limit: number }): Promise<StockEvent[]> {
    await this.unitOrThrow(farmId, unitId);
    const from = q.from ? Date.parse(q.from) : -Infinity;
    const to = q.to ? Date.parse(q.to) : Infinity;
    return (await this.repo.listEvents(unitId)).filter((e) => e.at.getTime() >= from && e.at.getTime() <= to).slice(-q.limit);
  }

  private estimateFrom(unit: CultureUnit, staleDays: number, events: StockEvent[], asOf: Date): UnitEstimate {
    const est = biomassAt(events.map(toStockInput), asOf.toISOString());
    const stocked = est.count > 0 && unit.state !== 'fallow';
    let ageWarning: string | null = null;
    if (stocked && est.meanWeightG === null) ageWarning = 'No weight on record: record a sample weighing';
    else if (stocked && est.estimateAgeDays !== null && est.estimateAgeDays > staleDays) {
      ageWarning = `Mean weight is ${Math.floor(est.estimateAgeDays)} days old (no growth is added since); weigh a sample`;
    }
    return {
      ...est,
      asOf,
      unit,
      stocked,
      densityKgPerM3: est.biomassKg !== null && unit.volumeM3 ? est.biomassKg / unit.volumeM3 : null,
      kgPerHa: est.biomassKg !== null && unit.areaM2 ? (est.biomassKg * 10_000) / unit.areaM2 : null,
      ageWarning,
    };
  }

  /** Count, mean weight (latest weighing, no growth added), biomass with its uncertainty, density. */
  async estimate(farmId: string, unitId: string, asOf = new Date()): Promise<UnitEstimate> {
    const unit = await this.unitOrThrow(farmId, unitId);
    const [staleDays, events] = await Promise.all([this.staleDays(farmId), this.repo.listEvents(unitId)]);
    return this.estimateFrom(unit, staleDays, events, asOf);
  }

  /** History, current biomass and FCR between weighings of one unit. */
  async unitStock(farmId: string, unitId: string, asOf = new Date()): Promise<UnitStock> {
    const unit = await this.unitOrThrow(farmId, unitId);
    const [staleDays, events] = await Promise.all([this.staleDays(farmId), this.repo.listEvents(unitId)]);
    const inputs = events.map(toStockInput);
    const timeline = stockTimeline(inputs);
    const first = events[0]?.at ?? asOf;
    const feedings = await this.feedLedger.fedBetween(unitId, new Date(first.getTime() - DAY), asOf);
    const fcr = fcrPeriods(
      inputs,
      feedings.map((f) => ({ fedAt: f.fedAt.toISOString(), fedKg: f.fedKg })),
    );
    const current = this.estimateFrom(unit, staleDays, events, asOf);
    const notes = [
      'Mean weight comes from the latest sample weighing; no growth is added between weighings.',
      'The biomass interval is the sampling error of the mean weight (Student t); the count is taken as exact.',
    ];
    if (current.ageWarning) notes.push(current.ageWarning);
    return {
      unit,
      current,
      history: events.map((event, i) => ({ event, after: timeline[i]! })),
      fcr,
      notes,
    };
  }

  /** The current estimate and latest FCR of every unit of the farm. */
  async farmStock(farmId: string, asOf = new Date()): Promise<Array<{ current: UnitEstimate; latestFcr: FcrPeriod | null }>> {
    const [staleDays, units] = await Promise.all([this.staleDays(farmId), this.repo.unitsOfFarm(farmId)]);
    const events = await this.repo.eventsOfUnits(units.map((u) => u.id));
    const out: Array<{ current: UnitEstimate; latestFcr: FcrPeriod | null }> = [];
    for (const unit of units) {
      const own = events.filter((e) => e.unitId === unit.id);
      const current = this.estimateFrom(unit, staleDays, own, asOf);
      let latestFcr: FcrPeriod | null = null;
      if (own.some((e) => e.kind === 'sample_weighing')) {
        const feedings = await this.feedLedger.fedBetween(unit.id, new Date((own[0]?.at.getTime() ?? asOf.getTime()) - DAY), asOf);
        const { periods } = fcrPeriods(own.map(toStockInput), feedings.map((f) => ({ fedAt: f.fedAt.toISOString(), fedKg: f.fedKg })));
        latestFcr = periods[periods.length - 1] ?? null;
      }
      out.push({ current, latestFcr });
    }
    return out;
  }

  /** Units of the farm with fish in them (and not fallow) at `asOf`. */
  async stockedUnits(farmId: string, asOf = new Date()): Promise<CultureUnit[]> {
    const units = await this.repo.unitsOfFarm(farmId);
    const events = await this.repo.eventsOfUnits(units.map((u) => u.id));
    return units.filter((u) => u.state !== 'fallow' && biomassAt(events.filter((e) => e.unitId === u.id).map(toStockInput), asOf.toISOString()).count > 0);
  }
}

function snapshot(e: StockEvent): Record<string, unknown> {
  return {
    kind: e.kind,
    unitId: e.unitId,
    at: e.at.toISOString(),
    count: e.count,
    totalWeightKg: e.totalWeightKg,
    meanWeightG: e.meanWeightG,
    sampleSize: e.sampleSize,
    sampleSdG: e.sampleSdG,
    meanLengthCm: e.meanLengthCm,
    relatedUnitId: e.relatedUnitId,
    note: e.note,
  };
}
