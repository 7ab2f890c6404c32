import type { EntityManager } from 'typeorm';
import type { AuditListResponse, AuditQuery } from '../../../shared/schemas/audit.schema';
import type { AuditEvent } from '../../db/entities';
import { badRequest } from '../../http/errors';
import type { AuditRepository } from './audit.repository';
import { presentAuditEvent } from './audit.presenter';

/** One audit entry: who did what to which record, with the record (or the changed fields) before and after. */
export type AuditEntry = {
  farmId: string | null;
  /** The signed-in user; null for the system (worker, ingest). */
  actorId: string | null;
  /** `<entity>.<verb>`, e.g. 'unit.updated', 'threshold_profile.updated'. */
  action: string;
  entity: string;
  entityId: string | null;
  before?: Record<string, unknown> | null;
  after?: Record<string, unknown> | null;
  /** Defaults to now. */
  at?: Date;
};

const encodeCursor = (e: { at: Date; id: string }) => Buffer.from(`${e.at.toISOString()}|${e.id}`).toString('base64url');
function decodeCursor(cursor: string): { at: Date; id: string } {
  const [at, id] = Buffer.from(cursor, 'base64url').toString('utf8').split('|');
  const when = at ? new Date(at) : null;
  if (!when || Number.isNaN(when.getTime()) || !id || !/^[0-9a-f-]{36}$/i.test(id)) {
    throw badRequest(
      'The paging cursor is not valid; start again without it.',
      { fieldErrors: { cursor: ['not a cursor this API issued'] } },
      'validation_failed',
    );
  }
  return { at: when, id };
}

/** Values a JSON column can hold: Dates become ISO strings, undefined fields are dropped. */
function jsonSafe(v: Record<string, unknown> | null | undefined): Record<string, unknown> | null {
  if (!v) return null;
  return JSON.parse(JSON.stringify(v)) as Record<string, unknown>;
}

/** Fields of `after` whose value differs from `before` (deep, by JSON), for compact update entries. */
export function changedFields(
  before: Record<string, unknown>,
  after: Record<string, unknown>,
): { before: Record<string, unknown>; after: Record<string, unknown> } {
  const b: Record<string, unknown> = {};
  const a: Record<string, unknown> = {};
  for (const key of new Set([...Object.keys(before), ...Object.keys(after)])) {
    if (JSON.stringify(before[key]) !== JSON.stringify(after[key])) {
      b[key] = before[key] ?? null;
      a[key] = after[key] ?? null;
    }
  }
  return { before: b, after: a };
}

export class AuditService {
  constructor(private readonly repo: AuditRepository) {}

  /**
   * Records one entry. Other modules call this after every change that matters (units, probes, farms,
   * thresholds, results). Pass `manager` to write inside the caller's transaction.
   */
  record(entry: AuditEntry, manager?: EntityManager): Promise<AuditEvent> {
    return this.repo.insert(
      {
        farmId: entry.farmId,
        actorId: entry.actorId,
        at: entry.at ?? new Date(),
        action: entry.action,
        entity: entry.entity,
        entityId: entry.entityId,
        before: jsonSafe(entry.before),
        after: jsonSafe(entry.after),
      },
      manager,
    );
  }

  async list(farmId: string, q: AuditQuery): Promise<AuditListResponse> {
    const rows = await this.repo.list({
      farmId,
      entity: q.entity,
      entityId: q.entityId,
      actorId: q.actorId,
      from: q.from ? new Date(q.from) : undefined,
      to: q.to ? new Date(q.to) : undefined,
      before: q.cursor ? decodeCursor(q.cursor) : undefined,
      limit: q.limit + 1,
    });
    const page = rows.slice(0, q.limit);
    const last = page[page.length - 1];
    return { items: page.map(presentAuditEvent), nextCursor: rows.length > q.limit && last ? encodeCursor(last) : null };
  }
}
