import type { OutboxDetail, OutboxList, OutboxMessageDto } from '../../../shared/schemas/outbox.schema';
import type { Matched, OutboxOne, OutboxPage } from './outbox.service';

export function presentMessage(m: Matched): OutboxMessageDto {
  const r = m.message;
  return {
    id: r.id,
    farmId: r.farmId,
    kind: r.kind,
    to: r.toAddress,
    subject: r.subject,
    status: r.status,
    providerMessageId: r.providerMessageId,
    error: r.error,
    relatedId: r.relatedId,
    createdAt: r.createdAt.toISOString(),
    sentAt: r.sentAt?.toISOString() ?? null,
    delivery: m.delivery,
    received:
      m.copy && m.matchedBy
        ? { id: m.copy.id, receivedAt: m.copy.receivedAt, from: m.copy.from, to: m.copy.to, subject: m.copy.subject, matchedBy: m.matchedBy }
        : null,
  };
}

export function presentList(p: OutboxPage): OutboxList {
  return { messages: p.items.map(presentMessage), nextCursor: p.nextCursor, catcherReachable: p.catcherReachable };
}

export function presentDetail(m: OutboxOne): OutboxDetail {
  return { ...presentMessage(m), body: m.message.body, receivedText: m.receivedText, catcherReachable: m.catcherReachable };
}
