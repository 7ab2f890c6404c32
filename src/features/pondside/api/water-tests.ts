import { freeAmmoniaResultSchema, waterTestSchema, type Analyte, type WaterTestDto } from '@shared/schemas/water-tests.schema';
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { farmKey } from '@/lib/query-client';

const f = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;
const u = (farmId: string, unitId: string) => `${f(farmId)}/units/${encodeURIComponent(unitId)}`;

/** Where a new kit result is POSTed (the outbox sends it). */
export const waterTestsPath = (farmId: string, unitId: string) => `${u(farmId, unitId)}/tests`;

const POLL_MS = 1500;
/** Stop asking after this long; the live stream or the next visit brings the result. */
const POLL_FOR_MS = 3 * 60_000;

export const waterTestQueries = {
  all: (farmId: string) => farmKey(farmId, 'water-tests'),
  /** One stored test, polled until the worker has computed its result. */
  detail: (farmId: string, testId: string) =>
    queryOptions({
      queryKey: [...waterTestQueries.all(farmId), 'detail', testId] as const,
      queryFn: ({ signal }) => api.get(`${f(farmId)}/tests/${encodeURIComponent(testId)}`, { schema: waterTestSchema, signal }),
      refetchInterval: (query) => {
        const data = query.state.data as WaterTestDto | undefined;
        if (data?.result || data?.analyte !== 'total_ammonia') return data ? false : POLL_MS;
        return Date.now() - Date.parse(data.createdAt) < POLL_FOR_MS ? POLL_MS : false;
      },
    }),
  list: (farmId: string, unitId: string, analyte?: Analyte, limit = 5) =>
    queryOptions({
      queryKey: [...waterTestQueries.all(farmId), 'list', unitId, { analyte, limit }] as const,
      queryFn: ({ signal }) =>
        api.get(`${u(farmId, unitId)}/tests`, { schema: z.object({ tests: z.array(waterTestSchema) }), signal, query: { analyte, limit } }),
      staleTime: 30_000,
    }),
  latestResult: (farmId: string, unitId: string) =>
    queryOptions({
      queryKey: [...waterTestQueries.all(farmId), 'latest', unitId] as const,
      queryFn: ({ signal }) =>
        api.get(`${u(farmId, unitId)}/results/latest`, { schema: z.object({ result: freeAmmoniaResultSchema.nullable() }), signal }),
      staleTime: 30_000,
    }),
};
