import { unitEvaluationSchema } from '@shared/schemas/alerts.schema';
import { farmStatusResponseSchema } from '@shared/schemas/farms.schema';
import { seriesResponseSchema } from '@shared/schemas/readings.schema';
import { thresholdProfileListResponseSchema } from '@shared/schemas/thresholds.schema';
import { unitSchema } from '@shared/schemas/units.schema';
import { freeAmmoniaResultSchema, waterTestSchema } from '@shared/schemas/water-tests.schema';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api, isApiError } from '@/lib/api-client';
import { rangeWindow, type ChartRange } from '../lib/ranges';
import { unitKeys } from './keys';

const farmPath = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;
const unitPath = (farmId: string, unitId: string) => `${farmPath(farmId)}/units/${encodeURIComponent(unitId)}`;

const latestResultResponse = z.object({ result: freeAmmoniaResultSchema.nullable() });
const testListResponse = z.object({ tests: z.array(waterTestSchema) });

/** Series buckets asked for: enough for a chart a few hundred pixels wide, whatever the range. */
const SERIES_POINTS = 480;

/** Query options of the units feature (keys in ./keys). */
export const unitQueries = {
  all: unitKeys.all,
  farmStatus: (farmId: string) =>
    queryOptions({
      queryKey: unitKeys.farmStatus(farmId),
      queryFn: ({ signal }) => api.get(`${farmPath(farmId)}/status`, { schema: farmStatusResponseSchema, signal }),
      staleTime: 15_000,
      refetchInterval: 60_000,
    }),
  detail: (farmId: string, unitId: string) =>
    queryOptions({
      queryKey: unitKeys.detail(farmId, unitId),
      queryFn: ({ signal }) => api.get(unitPath(farmId, unitId), { schema: unitSchema, signal }),
      staleTime: 5 * 60_000,
    }),
  profiles: (farmId: string) =>
    queryOptions({
      queryKey: unitKeys.profiles(farmId),
      queryFn: ({ signal }) => api.get(`${farmPath(farmId)}/threshold-profiles`, { schema: thresholdProfileListResponseSchema, signal }),
      staleTime: 5 * 60_000,
    }),
  latestResult: (farmId: string, unitId: string) =>
    queryOptions({
      queryKey: unitKeys.latestResult(farmId, unitId),
      queryFn: async ({ signal }) =>
        (await api.get(`${unitPath(farmId, unitId)}/results/latest`, { schema: latestResultResponse, signal })).result,
      staleTime: 30_000,
    }),
  tests: (farmId: string, unitId: string, fromIso: string) =>
    queryOptions({
      queryKey: unitKeys.tests(farmId, unitId, { from: fromIso }),
      queryFn: async ({ signal }) =>
        (await api.get(`${unitPath(farmId, unitId)}/tests`, { schema: testListResponse, signal, query: { from: fromIso, limit: 1000 } }))
          .tests,
      staleTime: 30_000,
      placeholderData: keepPreviousData,
    }),
  series: (farmId: string, unitId: string, range: ChartRange, quantities: readonly string[]) =>
    queryOptions({
      queryKey: unitKeys.series(farmId, unitId, { range, quantities: quantities.join(',') }),
      queryFn: ({ signal }) => {
        const { from, to } = rangeWindow(range);
        return api.get(`${unitPath(farmId, unitId)}/series`, {
          schema: seriesResponseSchema,
          signal,
          query: { quantities: quantities.join(','), from: from.toISOString(), to: to.toISOString(), maxPoints: SERIES_POINTS },
        });
      },
      staleTime: 60_000,
      placeholderData: keepPreviousData,
      enabled: quantities.length > 0,
    }),
  /** The alerts evaluation of the unit (EPA reference, open alerts); null where the server has none. */
  evaluation: (farmId: string, unitId: string) =>
    queryOptions({
      queryKey: unitKeys.evaluation(farmId, unitId),
      queryFn: async ({ signal }) => {
        try {
          return await api.get(`${unitPath(farmId, unitId)}/evaluation`, { schema: unitEvaluationSchema, signal });
        } catch (e) {
          if (isApiError(e) && e.status === 404) return null;
          throw e;
        }
      },
      staleTime: 60_000,
    }),
};
