import type { Redis } from 'ioredis';
import type { DataSource } from 'typeorm';
import type { Env } from './config/env';
import type { Logger } from './lib/logger';
import type { Mailer } from './lib/mailer';
import { AuthRepository } from './modules/auth/auth.repository';
import { AuthService } from './modules/auth/auth.service';
import { NotificationsRepository } from './modules/notifications/notifications.repository';
import { emailChannel, NotificationsService } from './modules/notifications/notifications.service';
import type { Queues } from './queues';
import { AuditEvent } from './db/entities';
import { LiveService } from './modules/live/live.service';
import { WaterTestsRepository } from './modules/water-tests/water-tests.repository';
import { WaterTestsService, type AuditSink } from './modules/water-tests/water-tests.service';
import { TreatmentsRepository } from './modules/treatments/treatments.repository';
import { TreatmentsService } from './modules/treatments/treatments.service';
import { ObservationsRepository } from './modules/observations/observations.repository';
import { ObservationsService } from './modules/observations/observations.service';
import { TasksRepository } from './modules/tasks/tasks.repository';
import { TasksService } from './modules/tasks/tasks.service';

export type CoreDeps = {
  config: Env;
  ds: DataSource;
  redis: Redis;
  queues: Queues;
  mailer: Mailer;
  logger: Logger;
};

/** The composition root: builds every service once. Server and worker both use it. */
export function createServices(deps: CoreDeps) {
  const notifications = new NotificationsService(new NotificationsRepository(deps.ds), emailChannel(deps.mailer), deps.logger);
  const auth = new AuthService(
    new AuthRepository(deps.ds),
    notifications,
    { jwtSecret: deps.config.JWT_SECRET, jwtTtlSeconds: deps.config.JWT_TTL_SECONDS, publicUrl: deps.config.PUBLIC_URL },
    deps.logger,
  );
  const live = new LiveService(deps.redis, deps.config.QUEUE_PREFIX, deps.logger);
  // Interim audit sink until the audit module's service is wired in.
  const auditSink: AuditSink = {
    record: (e) => deps.ds.getRepository(AuditEvent).save(deps.ds.getRepository(AuditEvent).create({ ...e, at: new Date() })),
  };
  const waterTests = new WaterTestsService(new WaterTestsRepository(deps.ds), deps.queues, live, auditSink, deps.logger);
  const treatments = new TreatmentsService(new TreatmentsRepository(deps.ds), deps.queues, auditSink);
  const observations = new ObservationsService(new ObservationsRepository(deps.ds), deps.queues, live);
  const tasks = new TasksService(new TasksRepository(deps.ds));
  return { notifications, auth, live, waterTests, treatments, observations, tasks };
}

export type Services = ReturnType<typeof createServices>;
