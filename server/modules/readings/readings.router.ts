import { seriesQuerySchema, seriesResponseSchema } from '../../../shared/schemas/readings.schema';
import { ANY_FARM_ROLE, defineRoute, farmRoles, unitParams, type RouteDef } from '../../http/route-registry';
import type { ReadingsService } from './readings.service';

export function readingsRoutes(readings: ReadingsService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/series',
      summary:
        'Probe series of a unit for charts: per quantity at most maxPoints (≤ 2000) points, raw when the range holds fewer readings, else time buckets with avg/min/max/n/suspect computed in SQL. Range ≤ 400 days; default the last 24 h.',
      tags: ['readings'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      query: seriesQuerySchema,
      response: seriesResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! }, query: { quantities: 'ph,water_temperature', maxPoints: 500 } }),
      handler: async ({ params, query }) => ({ body: await readings.series(params.farmId, params.unitId, query) }),
    }),
  ];
}
