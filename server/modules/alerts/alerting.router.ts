import type { RouteDef } from '../../http/route-registry';
import { onCallRoutes } from '../on-call/on-call.router';
import { queuesAdminRoutes } from '../queues-admin/queues-admin.router';
import { reportRoutes } from '../reports/reports.router';
import { thresholdRoutes } from '../thresholds/thresholds.router';
import type { Alerting } from './alert-services';
import { alertRoutes } from './alerts.router';

/** Routes of thresholds, alerts, on-call, morning reports and the dead-letter view (registered in server/http/routes.ts). */
export function alertingRoutes(s: Alerting): RouteDef[] {
  return [...thresholdRoutes(s.thresholds), ...alertRoutes(s.alerts, s.unitEvaluation), ...onCallRoutes(s.onCall), ...reportRoutes(s.reports), ...queuesAdminRoutes(s.queuesAdmin)];
}
