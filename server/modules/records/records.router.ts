import { recordsCsvColumns, recordsCsvQuerySchema, recordsQuerySchema, recordsResponseSchema } from '../../../shared/schemas/records.schema';
import type { Logger } from '../../lib/logger';
import { defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import { safeFileName, sendCsv, type Cell } from '../exports/csv-writer';
import { presentRecords, recordsCsvRows } from './records.presenter';
import type { RecordsService } from './records.service';

const RECORD_ROLES = ['manager', 'planner', 'admin'] as const;

async function* each(rows: Cell[][]): AsyncGenerator<Cell[]> {
  yield* rows;
}

export function recordsRoutes(records: RecordsService, logger: Logger): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/records',
      summary:
        'Inspection-ready records for a period (?from=&to= as farm-local days YYYY-MM-DD, `to` inclusive, or ISO instants; default the last 30 days): ' +
        'the water-quality log per unit with computed NH3 and provenance, treatments with withdrawal ends, mortalities, feed given and withheld with reasons.',
      tags: ['records'],
      access: farmRoles(...RECORD_ROLES),
      params: farmParams,
      query: recordsQuerySchema,
      response: recordsResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params, query }) => ({ body: presentRecords(await records.book(params.farmId, query)) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/records.csv',
      summary:
        'One section of the records as CSV (?section=water_quality|treatments|mortalities|feeding, same period parameters). ' +
        'Text cells starting with = + - @ tab or CR are prefixed with a single quote; numbers stay numbers.',
      tags: ['records'],
      access: farmRoles(...RECORD_ROLES),
      params: farmParams,
      query: recordsCsvQuerySchema,
      kind: 'raw',
      example: (f) => ({ params: { farmId: f.farmId! }, query: { section: 'water_quality' } }),
      handler: async ({ params, query, res }) => {
        const book = await records.book(params.farmId, query);
        const tz = book.farm.timeZone;
        await sendCsv(
          res,
          {
            fileName: safeFileName([book.farm.slug, 'records', query.section, book.period.fromDay, book.period.toDay]),
            header: recordsCsvColumns[query.section].map((c) => (c.endsWith('_local') ? `${c} (${tz})` : c)),
            rows: each(recordsCsvRows(book, query.section)),
          },
          (err) => logger.error({ err }, 'records CSV cut off by an error'),
        );
        return undefined;
      },
    }),
  ];
}
