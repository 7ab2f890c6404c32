import type { DataSource, FindOptionsWhere } from 'typeorm';
import { IsNull } from 'typeorm';
import { OutboxMessage } from '../../db/entities';

export type OutboxScope = { farmId: string } | { farmless: true } | { all: true };
export type OutboxFilter = { kind?: OutboxMessage['kind']; status?: OutboxMessage['status'] };

/** Read side of the notifications outbox (the notifications module writes these rows). */
export class OutboxRepository {
  constructor(private readonly ds: DataSource) {}

  /** Newest first; `after` is the last row of the previous page. */
  list(scope: OutboxScope, filter: OutboxFilter, after: { at: Date; id: string } | null, limit: number): Promise<OutboxMessage[]> {
    const qb = this.ds.getRepository(OutboxMessage).createQueryBuilder('m');
    if ('farmId' in scope) qb.where('m.farm_id = :farmId', { farmId: scope.farmId });
    else if ('farmless' in scope) qb.where('m.farm_id IS NULL');
    else qb.where('TRUE');
    if (filter.kind) qb.andWhere('m.kind = :kind', { kind: filter.kind });
    if (filter.status) qb.andWhere('m.status = :status', { status: filter.status });
    if (after) qb.andWhere('(m.created_at, m.id) < (:at, :id)', { at: after.at.toISOString(), id: after.id });
    return qb.orderBy('m.created_at', 'DESC').addOrderBy('m.id', 'DESC').limit(limit).getMany();
  }

  get(id: string, farmId: string | null | undefined): Promise<OutboxMessage | null> {
    const where: FindOptionsWhere<OutboxMessage> = { id };
    if (farmId) where.farmId = farmId;
    else if (farmId === null) where.farmId = IsNull();
    return this.ds.getRepository(OutboxMessage).findOneBy(where);
  }
}
