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
import { PeopleRepository } from './modules/people/people.repository';
import { PeopleService } from './modules/people/people.service';
import { PhotosService } from './modules/photos/photos.service';
import { join as joinPath } from 'node:path';
import { AuditRepository } from './modules/audit/audit.repository';
import { AuditService } from './modules/audit/audit.service';
import { FarmsRepository } from './modules/farms/farms.repository';
import { FarmsService } from './modules/farms/farms.service';
import { UnitsRepository } from './modules/units/units.repository';
import { UnitsService } from './modules/units/units.service';
import { ReadingsRepository } from './modules/readings/readings.repository';
import { ReadingsService } from './modules/readings/readings.service';
import { ProbesRepository } from './modules/probes/probes.repository';
import { ProbesService } from './modules/probes/probes.service';
import { ProbeHealthRepository } from './modules/probes/probe-health.repository';
import { ProbeHealthService } from './modules/probes/probe-health.service';
import { ProbeCredentialFileStore } from './modules/probes/probe-credential-file';
import { LiveService } from './modules/live/live.service';
import { WaterTestsRepository } from './modules/water-tests/water-tests.repository';
import { WaterTestsService, type AuditSink } from './modules/water-tests/water-tests.service';
import { TreatmentsRepository } from './modules/treatments/treatments.repository';
import { TreatmentsService } from './modules/treatments/treatments.service';
import { ObservationsRepository } from './modules/observations/observations.repository';
import { ObservationsService } from './modules/observations/observations.service';
import { TasksRepository } from './modules/tasks/tasks.repository';
import { TasksService } from './modules/tasks/tasks.service';
import { createAlerting } from './modules/alerts/alert-services';
import { createStockAndFeedServices } from './modules/feed/compose';
import { createImportsService } from './modules/imports/compose';
import { createExportsService } from './modules/exports/compose';
import { createRecordsService } from './modules/records/compose';
import { createOutboxService } from './modules/outbox/compose';

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
  const audit = new AuditService(new AuditRepository(deps.ds));
  const readings = new ReadingsService(new ReadingsRepository(deps.ds));
  const units = new UnitsService(new UnitsRepository(deps.ds), audit, readings, { publicUrl: deps.config.PUBLIC_URL });
  const farms = new FarmsService(new FarmsRepository(deps.ds), audit, units, readings);
  const probesRepository = new ProbesRepository(deps.ds);
  const probeHealth = new ProbeHealthService(probesRepository, new ProbeHealthRepository(deps.ds), farms);
  const credentialFile = deps.config.PROBE_CREDENTIALS_FILE ? new ProbeCredentialFileStore(deps.config.PROBE_CREDENTIALS_FILE, `mqtt://${deps.config.MQTT_HOST}:${deps.config.MQTT_PORT}`) : null;
  const probes = new ProbesService(probesRepository, probeHealth, audit, farms, units, credentialFile, deps.logger);
  const live = new LiveService(deps.redis, deps.config.QUEUE_PREFIX, deps.logger);
  const auditSink: AuditSink = audit;
  const waterTests = new WaterTestsService(new WaterTestsRepository(deps.ds), deps.queues, live, auditSink, deps.logger);
  const treatments = new TreatmentsService(new TreatmentsRepository(deps.ds), deps.queues, auditSink);
  const observations = new ObservationsService(new ObservationsRepository(deps.ds), deps.queues, live);
  const tasks = new TasksService(new TasksRepository(deps.ds));
  const alerting = createAlerting({ ds: deps.ds, queues: deps.queues, logger: deps.logger, publicUrl: deps.config.PUBLIC_URL, live, notifications, audit, farms, units, probes, readings, tasks });
  farms.useUnitStatusProvider(alerting.unitStatus);
  farms.useLatestResultProvider(async ({ units }) => {
    const rows = await waterTests.latestResultsOf(units.map((u) => u.id));
    return new Map(
      rows.map((r) => {
        const peak = r.forecastPeak as { nh3MgL: number; nh3NMgL: number; at: string; localTime: string } | null;
        return [
          r.unitId,
          {
            id: r.id,
            waterTestId: r.waterTestId,
            sampledAt: r.sampledAt.toISOString(),
            status: r.status,
            tanMgL: r.tanMgL,
            nh3NMgL: r.nh3NMgL,
            nh3MgL: r.nh3MgL,
            ph: r.ph,
            temperatureC: r.temperatureC,
            salinityPpt: r.salinityPpt,
            method: r.method,
            forecastPeak: peak ? { nh3MgL: peak.nh3MgL, nh3NMgL: peak.nh3NMgL, at: peak.at, localTime: peak.localTime } : null,
            flags: r.flags,
          },
        ];
      }),
    );
  });
  const stockAndFeed = createStockAndFeedServices({ ds: deps.ds, queues: deps.queues, live, audit, logger: deps.logger, waterTests, treatments, observations, farms, units });
  stockAndFeed.feed.useAlertSource(alerting.alerts);
  const imports = createImportsService({ ds: deps.ds, redis: deps.redis, queues: deps.queues, audit, logger: deps.logger, config: deps.config });
  const csvExports = createExportsService(deps.ds);
  const records = createRecordsService(deps.ds);
  const outbox = createOutboxService(deps.ds, deps.config.MAIL_FAKE_API_URL, deps.logger);
  const people = new PeopleService(new PeopleRepository(deps.ds), auth, notifications, audit, { publicUrl: deps.config.PUBLIC_URL }, deps.logger);
  const photos = new PhotosService(deps.ds, joinPath(deps.config.DATA_DIR, 'photos'));
  return { photos, people, notifications, auth, live, waterTests, treatments, observations, tasks, audit, readings, units, farms, probeHealth, probes, ...stockAndFeed, ...alerting, imports, csvExports, records, outbox };
}

export type Services = ReturnType<typeof createServices>;
