import type { JobPayload } from '../../shared/schemas/jobs.schema';
import { registerProcessor, type ProcessorDeps } from './index';

/** Every 30 s: queue the next on-call step of every unacknowledged act-level alert whose step is due. */
export async function escalateAlerts(_payload: JobPayload<'escalateAlerts'>, deps: ProcessorDeps) {
  return deps.services.escalation.tick();
}

registerProcessor('escalateAlerts', (payload, _job, deps) => escalateAlerts(payload as JobPayload<'escalateAlerts'>, deps));
