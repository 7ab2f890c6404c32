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
    payload: z.object({}),
  },
  escalateAlerts: {
    queue: 'alerts',
    name: 'escalate-alerts',
    payload: z.object({}),
  },
  notifyAlert: {
    queue: 'alerts',
    name: 'notify-alert',
    payload: z.object({ alertId: z.uuid(), step: z.number().int().min(0), reason: z.enum(['opened', 'escalated', 'realert']) }),
  },
  morningReport: {
    queue: 'reports',
    name: 'morning-report',
    payload: z.object({ farmId: z.uuid().optional() }),
  },
  recommendFeed: {
    queue: 'feed',
    name: 'recommend-feed',
    payload: z.object({ farmId: z.uuid(), unitId: z.uuid().optional(), day: z.string().regex(/^\d{4}-\d{2}-\d{2}$/).optional() }),
  },
} as const;

export type JobKey = keyof typeof jobs;
export type JobPayload<K extends JobKey> = z.infer<(typeof jobs)[K]['payload']>;
export const queueNames = ['results', 'evaluations', 'alerts', 'reports', 'feed'] as const;
export type QueueName = (typeof queueNames)[number];
