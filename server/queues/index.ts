import { Queue, type JobsOptions } from 'bullmq';
import type { Redis } from 'ioredis';
import { jobs, queueNames, type JobKey, type JobPayload, type QueueName } from '../../shared/schemas/jobs.schema';

export const defaultJobOptions: JobsOptions = {
  attempts: 5,
  backoff: { type: 'exponential', delay: 500 },
  removeOnComplete: { age: 24 * 3600, count: 5000 },
  removeOnFail: { age: 14 * 24 * 3600 },
};

export type Queues = {
  queue(name: QueueName): Queue;
  add<K extends JobKey>(key: K, payload: JobPayload<K>, opts?: JobsOptions): Promise<void>;
  close(): Promise<void>;
};

/** Typed producers over one BullMQ Queue per queue name; payloads are validated before they are queued. */
export function createQueues(connection: Redis, prefix: string): Queues {
  const map = new Map<QueueName, Queue>();
  for (const name of queueNames) map.set(name, new Queue(name, { connection, prefix, defaultJobOptions }));
  const queue = (name: QueueName) => {
    const q = map.get(name);
    if (!q) throw new Error(`unknown queue ${name}`);
    return q;
  };
  return {
    queue,
    async add(key, payload, opts) {
      const def = jobs[key];
      const data = def.payload.parse(payload);
      await queue(def.queue).add(def.name, data, opts);
    },
    async close() {
      await Promise.all([...map.values()].map((q) => q.close()));
    },
  };
}
