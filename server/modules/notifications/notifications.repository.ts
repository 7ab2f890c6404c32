import type { DataSource } from 'typeorm';
import { OutboxMessage } from '../../db/entities';

export class NotificationsRepository {
  constructor(private readonly ds: DataSource) {}
  async record(row: Pick<OutboxMessage, 'farmId' | 'kind' | 'toAddress' | 'subject' | 'body' | 'relatedId'>): Promise<OutboxMessage> {
    return this.ds.getRepository(OutboxMessage).save(this.ds.getRepository(OutboxMessage).create({ ...row, status: 'queued' }));
  }
  async markSent(id: string, providerMessageId: string): Promise<void> {
    await this.ds.getRepository(OutboxMessage).update({ id }, { status: 'sent', providerMessageId, sentAt: new Date(), error: null });
  }
  async markFailed(id: string, error: string): Promise<void> {
    await this.ds.getRepository(OutboxMessage).update({ id }, { status: 'failed', error });
  }
  listForFarm(farmId: string | null, limit: number): Promise<OutboxMessage[]> {
    return this.ds.getRepository(OutboxMessage).find({
      where: farmId ? { farmId } : {},
      order: { createdAt: 'DESC' },
      take: limit,
    });
  }
}
