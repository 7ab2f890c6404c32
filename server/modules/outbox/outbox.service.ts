import type { DeliveryState, OutboxQuery } from '../../../shared/schemas/outbox.schema';
import type { OutboxMessage } from '../../db/entities';
import { badRequest, notFound } from '../../http/errors';
import type { CaughtMail, MailCatcherClient } from './mail-catcher.client';
import type { OutboxRepository, OutboxScope } from './outbox.repository';

export type Matched = { message: OutboxMessage; delivery: DeliveryState; copy: CaughtMail | null; matchedBy: 'message_id' | 'recipient_subject' | null };
export type OutboxPage = { items: Matched[]; nextCursor: string | null; catcherReachable: boolean };
export type OutboxOne = Matched & { receivedText: string | null; catcherReachable: boolean };

/** A copy received this long before the row was written, or after it was sent, is another message. */
const MATCH_BEFORE_MS = 60_000;
const MATCH_AFTER_MS = 10 * 60_000;

const normalizeId = (id: string | null | undefined) => (id ?? '').trim().replace(/^<|>$/g, '').toLowerCase();

const encodeCursor = (m: OutboxMessage) => Buffer.from(`${m.createdAt.toISOString()}|${m.id}`).toString('base64url');
function decodeCursor(cursor: string): { at: Date; id: string } {
  const [at, id] = Buffer.from(cursor, 'base64url').toString('utf8').split('|');
  const when = at ? new Date(at) : null;
  if (!when || Number.isNaN(when.getTime()) || !id || !/^[0-9a-f-]{36}$/i.test(id)) {
    throw badRequest('The paging cursor is not valid; start again without it.', { fieldErrors: { cursor: ['not a cursor this API issued'] } }, 'validation_failed');
  }
  return { at: when, id };
}

/**
 * Pairs outbox rows with the catcher's copies: by Message-ID first (the id the provider answered), then
 * by recipient and subject close in time; each copy pairs with one row at most.
 */
export function matchCopies(rows: OutboxMessage[], copiesByRecipient: Map<string, CaughtMail[]> | null): Matched[] {
  const taken = new Set<string>();
  const out: Matched[] = rows.map((message) => ({ message, delivery: 'not_sent' as DeliveryState, copy: null, matchedBy: null }));
  if (!copiesByRecipient) {
    for (const m of out) if (m.message.status === 'sent') m.delivery = 'unknown';
    return out;
  }
  const copiesOf = (m: OutboxMessage) => copiesByRecipient.get(m.toAddress.toLowerCase()) ?? [];
  for (const m of out) {
    if (m.message.status !== 'sent') continue;
    const wanted = normalizeId(m.message.providerMessageId);
    const copy = wanted ? copiesOf(m.message).find((c) => !taken.has(c.id) && normalizeId(c.headers['message-id']) === wanted) : undefined;
    if (copy) {
      taken.add(copy.id);
      Object.assign(m, { copy, matchedBy: 'message_id', delivery: 'received' });
    }
  }
  for (const m of out) {
    if (m.message.status !== 'sent' || m.copy) continue;
    const from = m.message.createdAt.getTime() - MATCH_BEFORE_MS;
    const to = (m.message.sentAt ?? m.message.createdAt).getTime() + MATCH_AFTER_MS;
    const sentAt = (m.message.sentAt ?? m.message.createdAt).getTime();
    const candidates = copiesOf(m.message)
      .filter((c) => !taken.has(c.id) && c.subject === m.message.subject)
      .filter((c) => {
        const at = Date.parse(c.receivedAt);
        return at >= from && at <= to;
      })
      .sort((a, b) => Math.abs(Date.parse(a.receivedAt) - sentAt) - Math.abs(Date.parse(b.receivedAt) - sentAt));
    const copy = candidates[0];
    if (copy) {
      taken.add(copy.id);
      Object.assign(m, { copy, matchedBy: 'recipient_subject', delivery: 'received' });
    } else m.delivery = 'not_found';
  }
  return out;
}

export class OutboxService {
  constructor(
    private readonly repo: OutboxRepository,
    private readonly catcher: MailCatcherClient,
  ) {}

  /** The catcher's copies for every recipient of the rows, or null when it cannot be asked. */
  private async copiesFor(rows: OutboxMessage[]): Promise<Map<string, CaughtMail[]> | null> {
    const recipients = [...new Set(rows.filter((r) => r.status === 'sent').map((r) => r.toAddress.toLowerCase()))];
    if (!recipients.length) return new Map();
    const lists = await Promise.all(recipients.map((to) => this.catcher.listFor(to)));
    if (lists.some((l) => l === undefined)) return null;
    return new Map(recipients.map((to, i) => [to, lists[i] ?? []]));
  }

  async list(scope: OutboxScope, q: OutboxQuery): Promise<OutboxPage> {
    const after = q.cursor ? decodeCursor(q.cursor) : null;
    const rows = await this.repo.list(scope, { ...(q.kind ? { kind: q.kind } : {}), ...(q.status ? { status: q.status } : {}) }, after, q.limit + 1);
    const page = rows.slice(0, q.limit);
    const copies = await this.copiesFor(page);
    return {
      items: matchCopies(page, copies),
      nextCursor: rows.length > q.limit && page.length ? encodeCursor(page[page.length - 1]!) : null,
      catcherReachable: copies !== null,
    };
  }

  /** One message with the text we sent and, when the catcher has it, the text it received. */
  async get(id: string, farmId: string | null | undefined): Promise<OutboxOne> {
    const row = await this.repo.get(id, farmId);
    if (!row) throw notFound('Message');
    const copies = await this.copiesFor([row]);
    const [matched] = matchCopies([row], copies);
    let receivedText: string | null = null;
    let reachable = copies !== null;
    if (matched!.copy) {
      const full = await this.catcher.get(matched!.copy.id);
      if (full === undefined) reachable = false;
      receivedText = full ? full.text : matched!.copy.text;
    }
    return { ...matched!, receivedText, catcherReachable: reachable };
  }
}
