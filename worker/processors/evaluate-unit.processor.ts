import type { JobPayload } from '../../shared/schemas/jobs.schema';
import { registerProcessor, type ProcessorDeps } from './index';

/** One unit against its threshold profile: open, update or resolve its alerts, publish a status change. */
export async function evaluateUnit(payload: JobPayload<'evaluateUnit'>, deps: ProcessorDeps) {
  return deps.services.unitEvaluation.evaluateAndApply(payload.farmId, payload.unitId);
}

registerProcessor('evaluateUnit', (payload, _job, deps) => evaluateUnit(payload as JobPayload<'evaluateUnit'>, deps));
