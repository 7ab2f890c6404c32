import type {
  FeedingRecordDto,
  FeedingTableDto,
  FeedReasonDto,
  RationSheetDto,
  RationSheetRowDto,
  RecommendationDto,
  UnitRationDto,
} from '../../../shared/schemas/feed.schema';
import type { CultureUnit, FeedingRecord, FeedingTable, FeedRecommendation } from '../../db/entities';
import { presentEstimate } from '../stock/stock.presenter';
import { laterProposalsOf, RATION_CAUTION, type UnitPlan } from './feed.service';
import { FEED_RULE_VERSION } from '../../../shared/feed';

export function presentTable(t: FeedingTable): FeedingTableDto {
  return {
    id: t.id,
    farmId: t.farmId,
    species: t.species,
    name: t.name,
    source: t.source,
    maxKgPerHaPerDay: t.maxKgPerHaPerDay,
    rows: t.rows.map((r) => ({
      minTemperatureC: r.minTemperatureC,
      maxTemperatureC: r.maxTemperatureC,
      minWeightG: r.minWeightG,
      maxWeightG: r.maxWeightG,
      pctBodyWeightPerDay: r.pctBodyWeightPerDay,
      daysPerWeek: r.daysPerWeek,
      ...(r.note !== undefined ? { note: r.note } : {}),
      ...((r as { fcr?: number }).fcr !== undefined ? { fcr: (r as { fcr?: number }).fcr } : {}),
      ...((r as { dailyLengthGainCm?: number }).dailyLengthGainCm !== undefined ? { dailyLengthGainCm: (r as { dailyLengthGainCm?: number }).dailyLengthGainCm } : {}),
    })),
  };
}

// Rows stored before reasons carried a source and an effect read as notes without a source.
const presentReasons = (list: unknown): FeedReasonDto[] =>
  (Array.isArray(list) ? list : []).map((x: Partial<FeedReasonDto>) => ({
    code: String(x.code ?? 'unknown'),
    text: String(x.text ?? ''),
    source: x.source ?? null,
    effect: x.effect ?? 'note',
  }));

export function presentRecommendation(r: FeedRecommendation): RecommendationDto {
  const later = laterProposalsOf(r).at(-1);
  const { laterProposals: _kept, ...inputs } = r.inputs ?? {};
  return {
    id: r.id,
    farmId: r.farmId,
    unitId: r.unitId,
    day: r.day,
    biomassKg: r.biomassKg,
    plannedKg: r.plannedKg,
    plannedPctBw: r.plannedPctBw,
    action: r.action,
    cutPct: r.cutPct,
    recommendedKg: r.recommendedKg,
    reasons: presentReasons(r.reasons),
    inputs,
    ruleVersion: r.ruleVersion,
    status: r.status,
    approvedKg: r.approvedKg,
    overrideNote: r.overrideNote,
    decidedById: r.decidedById,
    decidedAt: r.decidedAt?.toISOString() ?? null,
    computedAt: r.computedAt.toISOString(),
    createdAt: r.createdAt.toISOString(),
    laterProposal:
      later && r.status !== 'pending'
        ? {
            computedAt: later.computedAt,
            action: later.action,
            cutPct: later.cutPct,
            plannedKg: later.plannedKg,
            recommendedKg: later.recommendedKg,
            reasons: presentReasons(later.reasons),
            ruleVersion: later.ruleVersion,
          }
        : null,
  };
}

export function presentFeeding(f: FeedingRecord): FeedingRecordDto {
  return {
    id: f.id,
    farmId: f.farmId,
    unitId: f.unitId,
    day: f.day,
    fedKg: f.fedKg,
    withheld: f.withheld,
    reason: f.reason,
    response: f.response,
    fedAt: f.fedAt.toISOString(),
    recordedById: f.recordedById,
    createdAt: f.createdAt.toISOString(),
  };
}

export const presentUnitSummary = (u: CultureUnit) => ({ id: u.id, code: u.code, name: u.name, kind: u.kind, species: u.species, walkOrder: u.walkOrder });

export function presentUnitRation(p: UnitPlan, stored: FeedRecommendation | null): UnitRationDto {
  return {
    day: p.day,
    unit: presentUnitSummary(p.unit),
    biomass: presentEstimate(p.biomass),
    plan: p.planDto,
    loading: p.loading,
    ammoniaLoad: p.ammoniaLoad,
    proposal: { action: p.decision.action, cutPct: p.decision.cutPct, recommendedKg: p.decision.recommendedKg, reasons: p.decision.reasons, ruleVersion: FEED_RULE_VERSION },
    recommendation: stored ? presentRecommendation(stored) : null,
  };
}

const sum = (xs: Array<number | null>) => Math.round(xs.reduce<number>((a, b) => a + (b ?? 0), 0) * 10) / 10;

export function presentRationSheet(s: {
  farm: { id: string };
  day: string;
  today: string;
  rows: Array<{ unit: CultureUnit; recommendation: FeedRecommendation | null; feeding: FeedingRecord | null }>;
}): RationSheetDto {
  const rows: RationSheetRowDto[] = s.rows.map(({ unit, recommendation: r, feeding: f }) => ({
    unit: presentUnitSummary(unit),
    recommendation: r ? presentRecommendation(r) : null,
    plannedKg: r?.plannedKg ?? null,
    recommendedKg: r?.recommendedKg ?? null,
    approvedKg: r?.approvedKg ?? null,
    status: r?.status ?? 'none',
    action: r?.action ?? null,
    reasons: r ? presentReasons(r.reasons) : [],
    toFeedKg: r && r.status !== 'pending' ? r.approvedKg : null,
    feeding: f ? presentFeeding(f) : null,
    fedKg: f?.fedKg ?? null,
    withheld: f?.withheld ?? null,
  }));
  return {
    farmId: s.farm.id,
    day: s.day,
    today: s.today,
    rows,
    totals: {
      plannedKg: sum(rows.map((r) => r.plannedKg)),
      recommendedKg: sum(rows.map((r) => r.recommendedKg)),
      approvedKg: sum(rows.map((r) => r.approvedKg)),
      fedKg: sum(rows.map((r) => r.fedKg)),
      pending: rows.filter((r) => r.status === 'pending').length,
      decided: rows.filter((r) => r.status === 'accepted' || r.status === 'overridden').length,
      fed: rows.filter((r) => r.feeding !== null).length,
    },
    caution: RATION_CAUTION,
  };
}
