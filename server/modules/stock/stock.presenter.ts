import type { FcrPeriod, StockPoint } from '../../../shared/feed';
import type { BiomassEstimateDto, FarmStockDto, FcrPeriodDto, StockEventDto, UnitStockDto } from '../../../shared/schemas/stock.schema';
import type { CultureUnit, StockEvent } from '../../db/entities';
import type { UnitEstimate, UnitStock } from './stock.service';

const r = (v: number | null, d: number): number | null => (v === null || !Number.isFinite(v) ? null : Math.round(v * 10 ** d) / 10 ** d);
const rn = (v: number, d: number): number => Math.round(v * 10 ** d) / 10 ** d;

export function presentStockEvent(e: StockEvent): StockEventDto {
  return {
    id: e.id,
    farmId: e.farmId,
    unitId: e.unitId,
    kind: e.kind,
    at: e.at.toISOString(),
    count: e.count,
    totalWeightKg: e.totalWeightKg,
    meanWeightG: e.meanWeightG,
    sampleSize: e.sampleSize,
    sampleSdG: e.sampleSdG,
    meanLengthCm: e.meanLengthCm,
    relatedUnitId: e.relatedUnitId,
    note: e.note,
    createdById: e.createdById,
    createdAt: e.createdAt.toISOString(),
  };
}

export const presentUnitRef = (u: CultureUnit) => ({ id: u.id, code: u.code, name: u.name, kind: u.kind, species: u.species });

export function presentEstimate(e: UnitEstimate): BiomassEstimateDto {
  return {
    asOf: e.asOf.toISOString(),
    stocked: e.stocked,
    count: e.count,
    meanWeightG: r(e.meanWeightG, 2),
    meanWeightSeG: r(e.meanWeightSeG, 3),
    sampleSize: e.sampleSize,
    biomassKg: r(e.biomassKg, 2),
    biomassSeKg: r(e.biomassSeKg, 3),
    biomass95: e.biomass95 ? { lowKg: rn(e.biomass95.lowKg, 2), highKg: rn(e.biomass95.highKg, 2) } : null,
    meanLengthCm: r(e.meanLengthCm, 2),
    lengthAt: e.lengthAt,
    weightFrom: e.weightFrom,
    weightAt: e.weightAt,
    estimateAgeDays: r(e.estimateAgeDays, 2),
    ageWarning: e.ageWarning,
    volumeM3: e.unit.volumeM3,
    areaM2: e.unit.areaM2,
    densityKgPerM3: r(e.densityKgPerM3, 3),
    kgPerHa: r(e.kgPerHa, 1),
  };
}

export function presentFcr(p: FcrPeriod): FcrPeriodDto {
  return {
    fromEventId: p.fromEventId,
    toEventId: p.toEventId,
    from: p.from,
    to: p.to,
    days: rn(p.days, 2),
    feedKg: rn(p.feedKg, 2),
    feedings: p.feedings,
    startBiomassKg: rn(p.startBiomassKg, 2),
    endBiomassKg: rn(p.endBiomassKg, 2),
    removedKg: rn(p.removedKg, 3),
    addedKg: rn(p.addedKg, 3),
    gainKg: rn(p.gainKg, 3),
    gainSeKg: r(p.gainSeKg, 4),
    fcr: r(p.fcr, 4),
    fcrSe: r(p.fcrSe, 4),
    fcr95: p.fcr95 ? { low: rn(p.fcr95.low, 4), high: r(p.fcr95.high, 4) } : null,
    note: p.note,
  };
}

const presentPoint = (p: StockPoint) => ({
  eventId: p.eventId,
  kind: p.kind,
  at: p.at,
  count: p.count,
  meanWeightG: r(p.meanWeightG, 2),
  biomassKg: r(p.biomassKg, 2),
  biomassSeKg: r(p.biomassSeKg, 3),
});

export const FCR_METHOD =
  'FCR = feed fed ÷ weight gained between two sample weighings; gain = end biomass − start biomass + fish that left (at the interpolated mean weight, or a harvest’s weighed total) − fish that came in. Uncertainty from the two samples’ standard errors (delta method, normal 95 %); feed and counts taken as exact.';

export function presentUnitStock(s: UnitStock): UnitStockDto {
  return {
    unit: presentUnitRef(s.unit),
    current: presentEstimate(s.current),
    history: s.history.map((h) => ({ event: presentStockEvent(h.event), after: presentPoint(h.after) })),
    fcr: { periods: s.fcr.periods.map(presentFcr), overall: s.fcr.overall ? presentFcr(s.fcr.overall) : null, method: FCR_METHOD },
    notes: s.notes,
  };
}

export function presentFarmStock(asOf: Date, rows: Array<{ current: UnitEstimate; latestFcr: FcrPeriod | null }>): FarmStockDto {
  return {
    asOf: asOf.toISOString(),
    units: rows.map((row) => ({ unit: presentUnitRef(row.current.unit), current: presentEstimate(row.current), latestFcr: row.latestFcr ? presentFcr(row.latestFcr) : null })),
  };
}
