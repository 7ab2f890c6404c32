import { UnrecoverableError, type Job } from 'bullmq';
import { jobs, type JobKey, type QueueName } from '../../shared/schemas/jobs.schema';
import type { Services } from '../../server/container';
import type { Logger } from '../../server/lib/logger';
import type { Queues } from '../../server/queues';

export type ProcessorDeps = { services: Services; queues: Queues; logger: Logger };
export type Processor = (payload: unknown, job: Job, deps: ProcessorDeps) => Promise<unknown>;

const byName = new Map<string, { key: JobKey; processor: Processor }>();

/** Each processor registers itself by job key; the payload is parsed with the job's schema before it runs. */
export function registerProcessor(key: JobKey, processor: Processor): void {
  byName.set(`${jobs[key].queue}:${jobs[key].name}`, { key, processor });
}

export function createProcessors(deps: ProcessorDeps) {
  return {
    async run(queue: QueueName, job: Job): Promise<unknown> {
      const entry = byName.get(`${queue}:${job.name}`);
      // Retrying cannot help a job nobody processes: fail it at once (it shows in the dead-letter view).
      if (!entry) throw new UnrecoverableError(`no processor for ${queue}:${job.name}`);
      const payload = jobs[entry.key].payload.parse(job.data);
      return entry.processor(payload, job, deps);
    },
    /** Repeating jobs (sweeps, escalation ticks, morning reports). */
    async schedule(): Promise<void> {
      const repeating: Array<[JobKey, number]> = [
        ['sweepFarms', 60_000],
        ['escalateAlerts', 30_000],
        ['morningReport', 5 * 60_000],
      ];
      for (const [key, every] of repeating) {
        if (!byName.has(`${jobs[key].queue}:${jobs[key].name}`)) continue;
        await deps.queues.queue(jobs[key].queue).upsertJobScheduler(jobs[key].name, { every }, { name: jobs[key].name, data: {} });
      }
    },
  };
}
