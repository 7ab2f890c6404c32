import type { JobPayload } from '../../shared/schemas/jobs.schema';
import { registerProcessor, type ProcessorDeps } from './index';

/**
 * Every 60 s without a farm: one sweep job per farm (job id per farm and minute, so overlapping ticks
 * queue it once, and a failing farm does not hold up the others). With a farm: every unit of it — silence,
 * overdue tests, calibration due, dawn projection, every threshold — and the re-alerts.
 */
export async function sweepFarms(payload: JobPayload<'sweepFarms'>, deps: ProcessorDeps) {
  if (!payload.farmId) {
    const minute = Math.floor(Date.now() / 60_000);
    const farmIds = await deps.services.unitEvaluation.farmIds();
    for (const farmId of farmIds) {
      await deps.queues.add('sweepFarms', { farmId }, { jobId: `sweep-${farmId}-${minute}`, attempts: 2, backoff: { type: 'fixed', delay: 5000 } });
    }
    return { farms: farmIds.length };
  }
  return deps.services.unitEvaluation.sweepFarm(payload.farmId);
}

registerProcessor('sweepFarms', (payload, _job, deps) => sweepFarms(payload as JobPayload<'sweepFarms'>, deps));
