import { z } from 'zod';

const isoTime = z.iso.datetime({ offset: true });

export const auditQuerySchema = z
  .object({
    /** e.g. unit, probe, farm, threshold_profile, water_test. */
    entity: z.string().min(1).max(60).optional(),
    entityId: z.string().min(1).max(100).optional(),
    actorId: z.uuid().optional(),
    /** Inclusive lower bound on the event time. */
    from: isoTime.optional(),
    /** Exclusive upper bound on the event time. */
    to: isoTime.optional(),
    limit: z.coerce.number().int().min(1).max(200).default(50),
    /** nextCursor of the previous page. */
    cursor: z.string().min(1).max(200).optional(),
  })
  .strict()
  .refine((q) => !q.from || !q.to || Date.parse(q.from) < Date.parse(q.to), { message: '`from` must be before `to`', path: ['from'] });
export type AuditQuery = z.output<typeof auditQuerySchema>;

export const auditEventSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid().nullable(),
  at: isoTime,
  /** <entity>.<verb>, e.g. unit.created, unit.updated, probe.credential_rotated. */
  action: z.string(),
  entity: z.string(),
  entityId: z.string().nullable(),
  /** Who did it; null for the system (worker, ingest). */
  actor: z.object({ id: z.uuid(), name: z.string(), email: z.string() }).nullable(),
  /** The changed fields before and after (whole records on create/delete). */
  before: z.record(z.string(), z.unknown()).nullable(),
  after: z.record(z.string(), z.unknown()).nullable(),
});
export type AuditEventDto = z.infer<typeof auditEventSchema>;

export const auditListResponseSchema = z.object({
  /** Newest first. */
  items: z.array(auditEventSchema),
  /** Pass as `cursor` for the next (older) page; null on the last page. */
  nextCursor: z.string().nullable(),
});
export type AuditListResponse = z.infer<typeof auditListResponseSchema>;
