import type { DataSource } from 'typeorm';
import type { Logger } from '../../lib/logger';
import type { Queues } from '../../queues';
import type { LiveService } from '../live/live.service';
import type { NotificationsService } from '../notifications/notifications.service';
import { OnCallRepository } from '../on-call/on-call.repository';
import { OnCallService } from '../on-call/on-call.service';
import type { ProbesService } from '../probes/probes.service';
import { QueuesAdminService } from '../queues-admin/queues-admin.service';
import type { ReadingsService } from '../readings/readings.service';
import { ReportsRepository } from '../reports/reports.repository';
import { ReportsService } from '../reports/reports.service';
import type { TasksService } from '../tasks/tasks.service';
import { ThresholdsRepository } from '../thresholds/thresholds.repository';
import { ThresholdsService, type AuditPort } from '../thresholds/thresholds.service';
import type { UnitsService } from '../units/units.service';
import { AlertsRepository } from './alerts.repository';
import { AlertsService } from './alerts.service';
import { EscalationService } from './escalation.service';
import { farmDirectoryFrom } from './ports';
import { UnitEvaluationService } from './unit-evaluation.service';
import { UnitFactsRepository } from './unit-facts.repository';
import type { FarmsService } from '../farms/farms.service';

export type AlertingDeps = {
  ds: DataSource;
  queues: Queues;
  logger: Logger;
  publicUrl: string;
  live: LiveService;
  notifications: NotificationsService;
  audit: AuditPort;
  farms: FarmsService;
  units: UnitsService;
  probes: ProbesService;
  readings: ReadingsService;
  tasks: TasksService;
};

/**
 * Builds thresholds, on-call, alerts (evaluation, lifecycle, escalation), morning reports and the
 * dead-letter view over the other modules' services. Called once from server/container.ts, which also
 * installs `unitStatus` as the farm map's status provider.
 */
export function createAlerting(d: AlertingDeps) {
  const farms = farmDirectoryFrom(d.farms);
  const thresholds = new ThresholdsService(new ThresholdsRepository(d.ds), d.audit, d.queues, d.logger);
  const onCall = new OnCallService(new OnCallRepository(d.ds), farms, d.audit);
  const alertsRepository = new AlertsRepository(d.ds);
  const alerts = new AlertsService(alertsRepository, d.live, d.queues, farms, d.logger);
  const escalation = new EscalationService(alertsRepository, onCall, d.notifications, farms, d.queues, { publicUrl: d.publicUrl }, d.logger);
  const unitEvaluation = new UnitEvaluationService({
    facts: new UnitFactsRepository(d.ds),
    thresholds,
    alerts,
    farms,
    units: d.units,
    probes: d.probes,
    readings: d.readings,
    tasks: d.tasks,
    live: d.live,
    logger: d.logger,
  });
  const reports = new ReportsService(new ReportsRepository(d.ds), alerts, d.units, onCall, d.notifications, farms, d.logger);
  const queuesAdmin = new QueuesAdminService(d.queues, d.logger);
  /** The farm map's UnitStatusProvider: status per unit from the open alerts, one call for all units. */
  const unitStatus = (q: { farmId: string; units: Array<{ id: string; state: string }> }) => alerts.statusFor(q.farmId, q.units);
  return { thresholds, onCall, alerts, escalation, unitEvaluation, reports, queuesAdmin, unitStatus };
}

export type Alerting = ReturnType<typeof createAlerting>;
