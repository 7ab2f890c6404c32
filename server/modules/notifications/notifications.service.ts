import type { Logger } from '../../lib/logger';
import type { Mailer } from '../../lib/mailer';
import type { OutboxMessage } from '../../db/entities';
import type { NotificationsRepository } from './notifications.repository';

export type Notification = {
  farmId: string | null;
  kind: OutboxMessage['kind'];
  to: string;
  subject: string;
  text: string;
  relatedId?: string | null;
};

/** A way to reach a person. E-mail today; a text-message provider plugs in here without touching alert logic. */
export interface NotificationChannel {
  readonly name: string;
  deliver(n: Notification): Promise<{ providerMessageId: string }>;
}

export function emailChannel(mailer: Mailer): NotificationChannel {
  return {
    name: 'email',
    async deliver(n) {
      const { messageId } = await mailer.send({ to: n.to, subject: n.subject, text: n.text });
      return { providerMessageId: messageId };
    },
  };
}

export class NotificationsService {
  constructor(
    private readonly repo: NotificationsRepository,
    private readonly channel: NotificationChannel,
    private readonly logger: Logger,
  ) {}

  /** Records the message in the outbox, then delivers it; a failed delivery is kept with its error and rethrown. */
  async send(n: Notification): Promise<OutboxMessage> {
    const row = await this.repo.record({
      farmId: n.farmId,
      kind: n.kind,
      toAddress: n.to,
      subject: n.subject,
      body: n.text,
      relatedId: n.relatedId ?? null,
    });
    try {
      const { providerMessageId } = await this.channel.deliver(n);
      await this.repo.markSent(row.id, providerMessageId);
      return { ...row, status: 'sent', providerMessageId };
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err);
      await this.repo.markFailed(row.id, message);
      this.logger.warn({ err: message, to: n.to, kind: n.kind }, 'notification delivery failed');
      throw err;
    }
  }

  listOutbox(farmId: string | null, limit = 100): Promise<OutboxMessage[]> {
    return this.repo.listForFarm(farmId, limit);
  }
}
