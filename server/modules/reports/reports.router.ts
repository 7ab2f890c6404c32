import {
  morningReportListQuerySchema,
  morningReportListResponseSchema,
  morningReportQuerySchema,
  morningReportSchema,
} from '../../../shared/schemas/reports.schema';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import type { ReportsService } from './reports.service';

export function reportRoutes(reports: ReportsService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/reports/morning',
      summary: "The morning report of a farm-local day (default today): lowest DO per unit overnight, aerator hours, alarms opened and who acknowledged them, missed checks. A day not stored yet answers a preview (stored: false).",
      tags: ['reports'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      query: morningReportQuerySchema,
      response: morningReportSchema,
      example: (f) => ({ params: { farmId: f.farmId! }, query: { day: f.day! } }),
      handler: async ({ params, query }) => ({ body: await reports.get(params.farmId, query.day) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/reports/morning/days',
      summary: 'Stored morning reports of the farm, newest day first.',
      tags: ['reports'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      query: morningReportListQuerySchema,
      response: morningReportListResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params, query }) => ({ body: { reports: await reports.list(params.farmId, query.limit) } }),
    }),
  ];
}
