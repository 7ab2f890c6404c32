import { z } from 'zod';

/** Every BullMQ job: its queue, name and payload schema. Processors parse their payload with these. */
export const jobs = {
  computeWaterTest: {
    queue: 'results',
    name: 'compute-water-test',
    payload: z.object({ farmId: z.uuid(), waterTestId: z.uuid(), version: z.number().int().positive() }),
  },
  evaluateUnit: {
    queue: 'evaluations',
    name: 'evaluate-unit',
    payload: z.object({ farmId: z.uuid(), unitId: z.uuid(), reason: z.string().max(64) }),
  },
  sweepFarms: {
    queue: 'evaluations',
    name: 'sweep-farms',
    // Without farmId (the 60 s schedule) it fans out one job per farm; with farmId it sweeps that farm.
    payload: z.object({ farmId: z.uuid().optional() }),
  },
  escalateAlerts: {
    queue: 'alerts',
    name: 'escalate-alerts',
    payload: z.object({}),
  },
  notifyAlert: {
    queue: 'alerts',
    name: 'notify-alert',
    payload: z.object({
      alertId: z.uuid(),
      step: z.number().int().min(0),
      reason: z.enum(['opened', 'escalated', 'realert', 'level_raised', 'assigned']),
      // Shown in the farm's dead-letter view (queues admin filters failed jobs by farmId).
      farmId: z.uuid().optional(),
      // The one person to tell, for 'assigned' and for a watch-level 'realert'; the on-call walk otherwise.
      userId: z.uuid().optional(),
    }),
  },
  morningReport: {
    queue: 'reports',
    name: 'morning-report',
    // Without farmId (the 5-minute schedule) it queues one job per farm whose report is due; with it, builds that farm's.
    payload: z.object({ farmId: z.uuid().optional(), day: z.string().regex(/^\d{4}-\d{2}-\d{2}$/).optional() }),
  },
  recommendFeed: {
    queue: 'feed',
    name: 'recommend-feed',
    payload: z.object({ farmId: z.uuid(), unitId: z.uuid().optional(), day: z.string().regex(/^\d{4}-\d{2}-\d{2}$/).optional() }),
  },
} as const;

export type JobKey = keyof typeof jobs;

/** A failed job as the farm's dead-letter view shows it (GET /api/farms/:farmId/jobs/failed). */
export const failedJobSchema = z.object({
  queue: z.string(),
  id: z.string(),
  name: z.string(),
  farmId: z.uuid(),
  data: z.record(z.string(), z.unknown()),
  failedReason: z.string(),
  attemptsMade: z.number().int(),
  attempts: z.number().int(),
  createdAt: z.iso.datetime({ offset: true }),
  failedAt: z.iso.datetime({ offset: true }).nullable(),
});
export type FailedJobDto = z.infer<typeof failedJobSchema>;
export const failedJobListResponseSchema = z.object({ jobs: z.array(failedJobSchema), truncated: z.boolean() });
export const retryFailedJobsRequestSchema = z
  .object({
    /** Jobs to retry; omit and pass all: true to retry every failed job of the farm. */
    jobs: z.array(z.object({ queue: z.string().min(1).max(40), id: z.string().min(1).max(200) })).max(500).optional(),
    all: z.boolean().optional(),
  })
  .strict()
  .refine((b) => b.all === true || b.jobs !== undefined, { message: 'list jobs or pass all: true' });
export const retryFailedJobsResponseSchema = z.object({
  retried: z.array(z.object({ queue: z.string(), id: z.string() })),
  /** Listed jobs that are not failed jobs of this farm (unknown, already retried, another farm's). */
  skipped: z.array(z.object({ queue: z.string(), id: z.string() })),
});
export type JobPayload<K extends JobKey> = z.infer<(typeof jobs)[K]['payload']>;
export const queueNames = ['results', 'evaluations', 'alerts', 'reports', 'feed'] as const;
export type QueueName = (typeof queueNames)[number];
