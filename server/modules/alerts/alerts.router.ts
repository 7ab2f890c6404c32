import { z } from 'zod';
import {
  acknowledgeAlertRequestSchema,
  alertDetailResponseSchema,
  alertListQuerySchema,
  alertListResponseSchema,
  alertSchema,
  alertSummaryResponseSchema,
  assignAlertRequestSchema,
  resolveAlertRequestSchema,
  unitEvaluationSchema,
} from '../../../shared/schemas/alerts.schema';
import type { AuthUser } from '../../http/auth-context';
import { unauthorized } from '../../http/errors';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, unitParams, type RouteDef } from '../../http/route-registry';
import type { AlertsService } from './alerts.service';
import type { UnitEvaluationService } from './unit-evaluation.service';

const alertParams = farmParams.extend({ alertId: z.uuid() });

/** The caller of a role-scoped route (the registry has already refused anonymous calls). */
function callerId(user: AuthUser | null): string {
  if (!user) throw unauthorized();
  return user.id;
}

export function alertRoutes(alerts: AlertsService, evaluation: UnitEvaluationService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/alerts',
      summary: 'Alerts of the farm, newest first: active (open or acknowledged) by default; filter by state, unit, kind and level; page with cursor.',
      tags: ['alerts'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      query: alertListQuerySchema,
      response: alertListResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! }, query: { state: 'all' } }),
      handler: async ({ params, query }) => ({ body: await alerts.list(params.farmId, query) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/alerts/summary',
      summary: 'Open alert counts of the farm and per unit, with each unit’s map status (clear, watch, act, silent).',
      tags: ['alerts'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      response: alertSummaryResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: await evaluation.summary(params.farmId) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/alerts/:alertId',
      summary: 'One alert with every step of its life (opened, level raised, notified, escalated, acknowledged, assigned, re-alerted, resolved).',
      tags: ['alerts'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: alertParams,
      response: alertDetailResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId!, alertId: f.alertId! } }),
      handler: async ({ params }) => ({ body: await alerts.get(params.farmId, params.alertId) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/alerts/:alertId/acknowledge',
      summary: 'Acknowledge an alert: stops the e-mail escalation; it re-alerts if still open after the farm’s re-alert minutes. Idempotent.',
      tags: ['alerts'],
      access: farmRoles('hand', 'manager', 'admin'),
      params: alertParams,
      body: acknowledgeAlertRequestSchema,
      response: alertSchema,
      example: (f) => ({ params: { farmId: f.farmId!, alertId: f.alertId! }, body: {} }),
      handler: async ({ params, body, user }) => ({ body: await alerts.acknowledge(params.farmId, params.alertId, callerId(user), body.note) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/alerts/:alertId/assign',
      summary: 'Assign an alert to a person of the farm, who is e-mailed.',
      tags: ['alerts'],
      access: farmRoles('manager', 'admin'),
      params: alertParams,
      body: assignAlertRequestSchema,
      response: alertSchema,
      example: (f) => ({ params: { farmId: f.farmId!, alertId: f.alertId! }, body: { userId: f.handId! } }),
      handler: async ({ params, body, user }) => ({ body: await alerts.assign(params.farmId, params.alertId, callerId(user), body.userId, body.note) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/alerts/:alertId/resolve',
      summary: 'Resolve an alert by hand with a note. If the condition is still there, the next evaluation opens a new alert.',
      tags: ['alerts'],
      access: farmRoles('manager', 'admin'),
      params: alertParams,
      body: resolveAlertRequestSchema,
      response: alertSchema,
      example: (f) => ({ params: { farmId: f.farmId!, alertId: f.alertId! }, body: { note: 'route check: handled' } }),
      handler: async ({ params, body, user }) => ({ body: await alerts.resolveByHand(params.farmId, params.alertId, callerId(user), body.note) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/evaluation',
      summary: 'The unit evaluated now against its threshold profile: every check with value, rule and verdict, the dawn DO projection at night, and US EPA 2013 reference lines (reference only).',
      tags: ['alerts'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      response: unitEvaluationSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params }) => ({ body: await evaluation.evaluate(params.farmId, params.unitId) }),
    }),
  ];
}
