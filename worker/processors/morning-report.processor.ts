import type { JobPayload } from '../../shared/schemas/jobs.schema';
import { registerProcessor, type ProcessorDeps } from './index';

/**
 * Every 5 min without a farm: queue a report job for each farm whose morningReportLocalTime has passed
 * (job id per farm and local day). With a farm: store the day's report once and e-mail it once.
 */
export async function morningReport(payload: JobPayload<'morningReport'>, deps: ProcessorDeps) {
  if (!payload.farmId) {
    const due = await deps.services.reports.dueFarms();
    for (const d of due) await deps.queues.add('morningReport', d, { jobId: `morning-${d.farmId}-${d.day}` });
    return { queued: due.length };
  }
  return deps.services.reports.buildAndSend(payload.farmId, payload.day);
}

registerProcessor('morningReport', (payload, _job, deps) => morningReport(payload as JobPayload<'morningReport'>, deps));
