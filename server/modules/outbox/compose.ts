import type { DataSource } from 'typeorm';
import type { Logger } from '../../lib/logger';
import { MailCatcherClient } from './mail-catcher.client';
import { OutboxRepository } from './outbox.repository';
import { OutboxService } from './outbox.service';

/** Builds the outbox view for the composition root (server/container.ts) in one line. */
export const createOutboxService = (ds: DataSource, mailCatcherUrl: string | null, logger: Logger): OutboxService =>
  new OutboxService(new OutboxRepository(ds), new MailCatcherClient(mailCatcherUrl || null, logger));
