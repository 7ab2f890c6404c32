import type { FlowMeasurementDto, LatestFlow, UnitDto } from '../../../shared/schemas/units.schema';
import type { CultureUnit, FlowMeasurement } from '../../db/entities';
import type { LatestFlowValue } from './units.service';

export function presentUnit(u: CultureUnit): UnitDto {
  return {
    id: u.id,
    farmId: u.farmId,
    code: u.code,
    name: u.name,
    kind: u.kind,
    outline: u.outline,
    areaM2: u.areaM2,
    volumeM3: u.volumeM3,
    waterType: u.waterType,
    defaultSalinityPpt: u.defaultSalinityPpt,
    species: u.species,
    lifeStage: u.lifeStage,
    state: u.state,
    testFrequencyDays: u.testFrequencyDays,
    qrLabelId: u.qrLabelId,
    walkOrder: u.walkOrder,
    thresholdProfileId: u.thresholdProfileId,
    feedProteinFraction: u.feedProteinFraction,
    closeWatchUntil: u.closeWatchUntil ? u.closeWatchUntil.toISOString() : null,
    createdAt: u.createdAt.toISOString(),
    updatedAt: u.updatedAt.toISOString(),
  };
}

export function presentFlow(f: FlowMeasurement): FlowMeasurementDto {
  return {
    id: f.id,
    unitId: f.unitId,
    measuredAt: f.measuredAt.toISOString(),
    flowLpm: f.flowLpm,
    source: f.source,
    note: f.note,
    recordedById: f.recordedById,
    createdAt: f.createdAt.toISOString(),
  };
}

export function presentLatestFlow(f: LatestFlowValue | null): LatestFlow | null {
  if (!f) return null;
  return { flowLpm: f.flowLpm, at: f.at.toISOString(), source: f.source, probeId: f.probeId, measurementId: f.measurementId };
}
