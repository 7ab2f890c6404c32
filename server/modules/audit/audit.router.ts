import { auditListResponseSchema, auditQuerySchema } from '../../../shared/schemas/audit.schema';
import { defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import type { AuditService } from './audit.service';

export function auditRoutes(audit: AuditService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/audit',
      summary:
        'Audit trail of the farm, newest first: who changed what, when, before and after. Filter by entity, entityId, actor and time; page with cursor.',
      tags: ['audit'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      query: auditQuerySchema,
      response: auditListResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! }, query: { limit: 20 } }),
      handler: async ({ params, query }) => ({ body: await audit.list(params.farmId, query) }),
    }),
  ];
}
