import { exportQuerySchema } from '../../../shared/schemas/exports.schema';
import type { Logger } from '../../lib/logger';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import { sendCsv } from './csv-writer';
import type { ExportsService } from './exports.service';

const CSV_NOTE =
  ' Streamed CSV (text/csv, UTF-8 with BOM, CRLF), header row first; ?unitId=&from=&to= (ISO instants, default the last 7 days, at most 366).' +
  ' Text cells starting with = + - @ tab or CR are prefixed with a single quote; numbers are plain numbers.';

export function exportRoutes(exportsService: ExportsService, logger: Logger): RouteDef[] {
  const onError = (err: unknown) => logger.error({ err }, 'CSV export cut off by an error');
  const example = (f: Record<string, string>) => ({ params: { farmId: f.farmId! } });
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/exports/readings.csv',
      summary: `Probe readings: one row per probe sample, a column per quantity in its stored unit, quality flags.${CSV_NOTE}`,
      tags: ['exports'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      query: exportQuerySchema,
      kind: 'raw',
      example,
      handler: async ({ params, query, res }) => {
        await sendCsv(res, await exportsService.readings(params.farmId, query), onError);
        return undefined;
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/exports/tests.csv',
      summary: `Kit and meter results with handheld values, notes and who entered them.${CSV_NOTE}`,
      tags: ['exports'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      query: exportQuerySchema,
      kind: 'raw',
      example,
      handler: async ({ params, query, res }) => {
        await sendCsv(res, await exportsService.tests(params.farmId, query), onError);
        return undefined;
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/exports/results.csv',
      summary: `Computed free ammonia (TAN, NH3-N, NH3, fraction) with the pH, temperature and salinity used and where each came from.${CSV_NOTE}`,
      tags: ['exports'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      query: exportQuerySchema,
      kind: 'raw',
      example,
      handler: async ({ params, query, res }) => {
        await sendCsv(res, await exportsService.results(params.farmId, query), onError);
        return undefined;
      },
    }),
  ];
}
