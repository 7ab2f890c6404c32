import type { DataSource, EntityManager } from 'typeorm';
import { AuditEvent } from '../../db/entities';

export type AuditRow = AuditEvent & { actorName: string | null; actorEmail: string | null };

export type AuditFilter = {
  farmId: string;
  entity?: string | undefined;
  entityId?: string | undefined;
  actorId?: string | undefined;
  from?: Date | undefined;
  to?: Date | undefined;
  /** Keyset: events strictly older than this (at, id). */
  before?: { at: Date; id: string } | undefined;
  limit: number;
};

export class AuditRepository {
  constructor(private readonly ds: DataSource) {}

  async insert(row: Omit<AuditEvent, 'id'>, manager?: EntityManager): Promise<AuditEvent> {
    const repo = (manager ?? this.ds.manager).getRepository(AuditEvent);
    return repo.save(repo.create(row));
  }

  /** Newest first, keyset-paged on (at, id) so pages stay stable while new events arrive; served by ix_audit_events_farm_at. */
  async list(f: AuditFilter): Promise<AuditRow[]> {
    const where = ['e.farm_id = $1'];
    const args: unknown[] = [f.farmId];
    const add = (sql: string, value: unknown) => {
      args.push(value);
      where.push(sql.replace('?', `$${args.length}`));
    };
    if (f.entity) add('e.entity = ?', f.entity);
    if (f.entityId) add('e.entity_id = ?', f.entityId);
    if (f.actorId) add('e.actor_id = ?', f.actorId);
    if (f.from) add('e.at >= ?', f.from);
    if (f.to) add('e.at < ?', f.to);
    if (f.before) {
      args.push(f.before.at, f.before.id);
      where.push(`(e.at, e.id) < ($${args.length - 1}, $${args.length}::uuid)`);
    }
    args.push(f.limit);
    const rows = (await this.ds.query(
      `SELECT e.id, e.farm_id, e.actor_id, e.at, e.action, e.entity, e.entity_id, e.before, e.after,
              u.name AS actor_name, u.email AS actor_email
       FROM audit_events e LEFT JOIN users u ON u.id = e.actor_id
       WHERE ${where.join(' AND ')}
       ORDER BY e.at DESC, e.id DESC
       LIMIT $${args.length}`,
      args,
    )) as Array<{
      id: string;
      farm_id: string | null;
      actor_id: string | null;
      at: Date;
      action: string;
      entity: string;
      entity_id: string | null;
      before: Record<string, unknown> | null;
      after: Record<string, unknown> | null;
      actor_name: string | null;
      actor_email: string | null;
    }>;
    return rows.map((r) => ({
      id: r.id,
      farmId: r.farm_id,
      actorId: r.actor_id,
      at: r.at,
      action: r.action,
      entity: r.entity,
      entityId: r.entity_id,
      before: r.before,
      after: r.after,
      actorName: r.actor_name,
      actorEmail: r.actor_email,
    }));
  }
}
