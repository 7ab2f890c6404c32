import type { Job } from 'bullmq';
import { queueNames, type FailedJobDto, type QueueName } from '../../../shared/schemas/jobs.schema';
import type { Logger } from '../../lib/logger';
import type { Queues } from '../../queues';

/** How many failed jobs per queue the dead-letter view looks through. */
const SCAN_PER_QUEUE = 1000;

const farmOf = (job: Job): string | null => {
  const data = job.data as { farmId?: unknown } | null;
  return data && typeof data.farmId === 'string' ? data.farmId : null;
};

/**
 * The farm's dead-letter view: failed jobs whose payload names this farm (jobs of every farm share the
 * queues, so a job without the farm's id — a sweep tick, another farm's — is never shown or retried).
 */
export class QueuesAdminService {
  constructor(
    private readonly queues: Queues,
    private readonly logger: Logger,
  ) {}

  private async failedOf(farmId: string): Promise<{ jobs: Array<{ queue: QueueName; job: Job }>; truncated: boolean }> {
    const out: Array<{ queue: QueueName; job: Job }> = [];
    let truncated = false;
    for (const name of queueNames) {
      const q = this.queues.queue(name);
      const jobs = await q.getFailed(0, SCAN_PER_QUEUE - 1);
      if (jobs.length >= SCAN_PER_QUEUE) truncated = true;
      for (const job of jobs) if (job && farmOf(job) === farmId) out.push({ queue: name, job });
    }
    out.sort((a, b) => (b.job.finishedOn ?? b.job.timestamp) - (a.job.finishedOn ?? a.job.timestamp));
    return { jobs: out, truncated };
  }

  async listFailed(farmId: string): Promise<{ jobs: FailedJobDto[]; truncated: boolean }> {
    const { jobs, truncated } = await this.failedOf(farmId);
    return {
      truncated,
      jobs: jobs.map(({ queue, job }) => ({
        queue,
        id: String(job.id),
        name: job.name,
        farmId,
        data: (job.data ?? {}) as Record<string, unknown>,
        failedReason: job.failedReason ?? '',
        attemptsMade: job.attemptsMade,
        attempts: job.opts.attempts ?? 1,
        createdAt: new Date(job.timestamp).toISOString(),
        failedAt: job.finishedOn ? new Date(job.finishedOn).toISOString() : null,
      })),
    };
  }

  /** Retries the listed failed jobs of this farm (or all of them); anything else is skipped. */
  async retry(farmId: string, body: { jobs?: Array<{ queue: string; id: string }> | undefined; all?: boolean | undefined }) {
    const retried: Array<{ queue: string; id: string }> = [];
    const skipped: Array<{ queue: string; id: string }> = [];
    const targets: Array<{ queue: string; id: string; job: Job | null }> = [];
    if (body.all) {
      for (const { queue, job } of (await this.failedOf(farmId)).jobs) targets.push({ queue, id: String(job.id), job });
    }
    for (const t of body.jobs ?? []) {
      if (!(queueNames as readonly string[]).includes(t.queue)) {
        skipped.push(t);
        continue;
      }
      const job = (await this.queues.queue(t.queue as QueueName).getJob(t.id)) ?? null;
      targets.push({ queue: t.queue, id: t.id, job });
    }
    const done = new Set<string>();
    for (const t of targets) {
      const key = `${t.queue}/${t.id}`;
      if (done.has(key)) continue;
      done.add(key);
      const state = t.job ? await t.job.getState() : null;
      if (!t.job || farmOf(t.job) !== farmId || state !== 'failed') {
        skipped.push({ queue: t.queue, id: t.id });
        continue;
      }
      await t.job.retry('failed');
      retried.push({ queue: t.queue, id: t.id });
    }
    if (retried.length) this.logger.info({ farmId, retried: retried.length }, 'failed jobs retried');
    return { retried, skipped };
  }
}
