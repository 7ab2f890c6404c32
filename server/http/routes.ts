import type { AppDeps } from '../app';
import { authRoutes } from '../modules/auth/auth.router';
import { healthRoutes } from '../modules/health/health.router';
import { liveRoutes } from '../modules/live/live.router';
import { waterTestRoutes } from '../modules/water-tests/water-tests.router';
import { treatmentRoutes } from '../modules/treatments/treatments.router';
import { observationRoutes } from '../modules/observations/observations.router';
import { taskRoutes } from '../modules/tasks/tasks.router';
import { peopleRoutes } from '../modules/people/people.router';
import { photoRoutes } from '../modules/photos/photos.router';
import { stockRoutes } from '../modules/stock/stock.router';
import { feedRoutes } from '../modules/feed/feed.router';
import { auditRoutes } from '../modules/audit/audit.router';
import { alertingRoutes } from '../modules/alerts/alerting.router';
import { farmsRoutes } from '../modules/farms/farms.router';
import { unitsRoutes } from '../modules/units/units.router';
import { probesRoutes } from '../modules/probes/probes.router';
import { readingsRoutes } from '../modules/readings/readings.router';
import { importRoutes } from '../modules/imports/imports.router';
import { exportRoutes } from '../modules/exports/exports.router';
import { recordsRoutes } from '../modules/records/records.router';
import { outboxRoutes } from '../modules/outbox/outbox.router';
import type { CookieOptions } from './build-router';
import type { RouteDef } from './route-registry';

/** The route registry: every API route, declared once. It builds the router, OpenAPI and the route × role test. */
export function allRoutes(deps: AppDeps, cookie: CookieOptions): RouteDef[] {
  const { services } = deps;
  return [
    ...healthRoutes(deps.health),
    ...authRoutes(services.auth, cookie, deps.authLimits),
    ...liveRoutes(services.live),
    ...waterTestRoutes(services.waterTests),
    ...treatmentRoutes(services.treatments),
    ...observationRoutes(services.observations),
    ...taskRoutes(services.tasks),
    ...peopleRoutes(services.people, services.farms),
    ...photoRoutes(services.photos),
    ...stockRoutes(services.stock),
    ...feedRoutes(services),
    ...farmsRoutes(services.farms),
    ...unitsRoutes(services.units),
    ...probesRoutes(services.probes, deps.broker),
    ...readingsRoutes(services.readings),
    ...auditRoutes(services.audit),
    ...importRoutes(services.imports, services.auth),
    ...exportRoutes(services.csvExports, deps.logger),
    ...recordsRoutes(services.records, deps.logger),
    ...outboxRoutes(services.outbox),
    ...alertingRoutes(services),
  ];
}
