import type { ThresholdProfileDto, ThresholdRuleDto } from '../../../shared/schemas/thresholds.schema';
import type { ThresholdProfile } from '../../db/entities';

export function presentRule(r: ThresholdProfile['rules'][number]): ThresholdRuleDto {
  return {
    metric: r.metric,
    watch: r.watch,
    act: r.act,
    basis: r.basis,
    source: r.source,
    ...(r.bySalinity ? { bySalinity: r.bySalinity.map((p) => ({ salinityPpt: p.salinityPpt, act: p.act, ...(p.watch !== undefined ? { watch: p.watch } : {}) })) } : {}),
  };
}

export function presentProfile(p: ThresholdProfile, unitIds: string[]): ThresholdProfileDto {
  return {
    id: p.id,
    farmId: p.farmId,
    name: p.name,
    species: p.species,
    lifeStage: p.lifeStage,
    rules: p.rules.map(presentRule),
    unitIds,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  };
}
