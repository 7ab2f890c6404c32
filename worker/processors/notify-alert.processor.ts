import type { JobPayload } from '../../shared/schemas/jobs.schema';
import { registerProcessor, type ProcessorDeps } from './index';

/** One notification step of an alert (job id per alert and step; the step is recorded, so a rerun sends nothing). */
export async function notifyAlert(payload: JobPayload<'notifyAlert'>, deps: ProcessorDeps) {
  return deps.services.escalation.deliver(payload);
}

registerProcessor('notifyAlert', (payload, _job, deps) => notifyAlert(payload as JobPayload<'notifyAlert'>, deps));
