import {
  failedJobListResponseSchema,
  retryFailedJobsRequestSchema,
  retryFailedJobsResponseSchema,
} from '../../../shared/schemas/jobs.schema';
import { defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import type { QueuesAdminService } from './queues-admin.service';

export function queuesAdminRoutes(admin: QueuesAdminService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/jobs/failed',
      summary: "Dead-letter view: the farm's background jobs that failed after all their attempts, newest first (only jobs whose payload names this farm).",
      tags: ['queues'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      response: failedJobListResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: await admin.listFailed(params.farmId) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/jobs/failed/retry',
      summary: "Retry failed jobs of the farm: the listed ones, or all with { all: true }. Jobs that are not this farm's failed jobs are skipped.",
      tags: ['queues'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      body: retryFailedJobsRequestSchema,
      response: retryFailedJobsResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! }, body: { jobs: [] } }),
      handler: async ({ params, body }) => ({ body: await admin.retry(params.farmId, body) }),
    }),
  ];
}
