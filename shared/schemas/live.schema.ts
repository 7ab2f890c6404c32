import { z } from 'zod';

/** Server-sent events on /api/farms/:farmId/events. Clients invalidate their caches by type and unit. */
export const liveEventTypes = ['readings', 'result', 'status', 'alert', 'recommendation', 'task'] as const;
export const liveEventSchema = z.object({
  type: z.enum(liveEventTypes),
  farmId: z.uuid(),
  unitId: z.uuid().nullable().optional(),
  at: z.string(),
  data: z.record(z.string(), z.unknown()).optional(),
});
export type LiveEvent = z.infer<typeof liveEventSchema>;
