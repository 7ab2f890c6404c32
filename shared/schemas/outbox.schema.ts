import { z } from 'zod';

// What the product sent (outbox rows) beside what the mail catcher received. `delivery` says how the
// two compare: received (the catcher has it), not_found (sent, but the catcher has no copy — it keeps
// only its newest messages), not_sent (queued or failed here), unknown (the catcher could not be asked).

export const outboxKinds = ['alert', 'escalation', 'digest', 'invitation', 'password_reset'] as const;
export const outboxStatuses = ['queued', 'sent', 'failed'] as const;
export const deliveryStates = ['received', 'not_found', 'not_sent', 'unknown'] as const;
export type DeliveryState = (typeof deliveryStates)[number];

export const outboxQuerySchema = z.object({
  kind: z.enum(outboxKinds).optional(),
  status: z.enum(outboxStatuses).optional(),
  /** Paging: the `nextCursor` of the previous page. */
  cursor: z.string().max(200).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});
export type OutboxQuery = z.infer<typeof outboxQuerySchema>;

export const globalOutboxQuerySchema = outboxQuerySchema.extend({
  /** farmless: only messages that belong to no farm (password resets, invitations); all: every message. */
  scope: z.enum(['farmless', 'all']).default('farmless'),
});
export type GlobalOutboxQuery = z.infer<typeof globalOutboxQuerySchema>;

export const receivedCopySchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  /** How the copy was matched to the outbox row. */
  matchedBy: z.enum(['message_id', 'recipient_subject']),
});

export const outboxMessageSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid().nullable(),
  kind: z.enum(outboxKinds),
  to: z.string(),
  subject: z.string(),
  status: z.enum(outboxStatuses),
  providerMessageId: z.string().nullable(),
  error: z.string().nullable(),
  relatedId: z.string().nullable(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
  delivery: z.enum(deliveryStates),
  received: receivedCopySchema.nullable(),
});
export type OutboxMessageDto = z.infer<typeof outboxMessageSchema>;

export const outboxListSchema = z.object({
  messages: z.array(outboxMessageSchema),
  nextCursor: z.string().nullable(),
  /** False when the mail catcher did not answer: every `delivery` is then 'unknown'. */
  catcherReachable: z.boolean(),
});
export type OutboxList = z.infer<typeof outboxListSchema>;

export const outboxDetailSchema = outboxMessageSchema.extend({
  /** The text the product handed to the mail provider. */
  body: z.string(),
  /** The text the catcher received (null when there is no received copy). */
  receivedText: z.string().nullable(),
  catcherReachable: z.boolean(),
});
export type OutboxDetail = z.infer<typeof outboxDetailSchema>;
