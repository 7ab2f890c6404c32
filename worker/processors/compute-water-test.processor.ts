import type { JobPayload } from '../../shared/schemas/jobs.schema';
import { registerProcessor, type ProcessorDeps } from './index';

/** Kit result → free ammonia with provenance. Idempotent: the result row is keyed by the test. */
export async function computeWaterTest(payload: JobPayload<'computeWaterTest'>, deps: ProcessorDeps) {
  const result = await deps.services.waterTests.computeResult(payload.waterTestId, payload.version);
  return result ? { status: result.status, nh3MgL: result.nh3MgL } : { skipped: true };
}

registerProcessor('computeWaterTest', (payload, _job, deps) => computeWaterTest(payload as JobPayload<'computeWaterTest'>, deps));
