import { onCallResponseSchema, putOnCallRequestSchema } from '../../../shared/schemas/alerts.schema';
import { defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import type { OnCallService } from './on-call.service';

export function onCallRoutes(onCall: OnCallService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/on-call',
      summary: 'The on-call list in escalation order, with the farm-local hours each person covers and who would be e-mailed first now.',
      tags: ['on-call'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      response: onCallResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: await onCall.get(params.farmId) }),
    }),
    defineRoute({
      method: 'put',
      path: '/api/farms/:farmId/on-call',
      summary: 'Replace the on-call list (order = escalation order; everyone must belong to the farm). Audited.',
      tags: ['on-call'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      body: putOnCallRequestSchema,
      response: onCallResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! }, body: { entries: [{ userId: f.managerId!, startsLocal: '00:00', endsLocal: '24:00', weekdays: [1, 2, 3, 4, 5, 6, 7] }] } }),
      handler: async ({ params, body, user }) => ({ body: await onCall.put(params.farmId, body, user?.id ?? null) }),
    }),
  ];
}
