import { farmStatusResponseSchema } from '@shared/schemas/farms.schema';
import { thresholdProfileListResponseSchema } from '@shared/schemas/thresholds.schema';
import { unitListResponseSchema } from '@shared/schemas/units.schema';
import { waterTestSchema, type Analyte } from '@shared/schemas/water-tests.schema';
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api, isApiError } from '@/lib/api-client';
import type { LiveEventKeys } from '@/lib/live-events';
import { farmKey } from '@/lib/query-client';

const f = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;

export const nightRoundQueries = {
  all: (farmId: string) => farmKey(farmId, 'night-round'),
  units: (farmId: string) =>
    queryOptions({
      queryKey: [...nightRoundQueries.all(farmId), 'units'] as const,
      queryFn: ({ signal }) => api.get(`${f(farmId)}/units`, { schema: unitListResponseSchema, signal }),
      staleTime: 5 * 60_000,
    }),
  status: (farmId: string) =>
    queryOptions({
      queryKey: [...nightRoundQueries.all(farmId), 'status'] as const,
      queryFn: ({ signal }) => api.get(`${f(farmId)}/status`, { schema: farmStatusResponseSchema, signal }),
      staleTime: 30_000,
      refetchInterval: 60_000,
    }),
  /** The newest hand reading of one analyte on a unit (for comparison with tonight's). */
  last: (farmId: string, unitId: string, analyte: Analyte) =>
    queryOptions({
      queryKey: [...nightRoundQueries.all(farmId), 'last', unitId, analyte] as const,
      queryFn: async ({ signal }) => {
        const r = await api.get(`${f(farmId)}/units/${encodeURIComponent(unitId)}/tests`, {
          schema: z.object({ tests: z.array(waterTestSchema) }),
          signal,
          query: { analyte, limit: 1 },
        });
        return r.tests[0] ?? null;
      },
      staleTime: 60_000,
    }),
  thresholds: (farmId: string) =>
    queryOptions({
      queryKey: [...nightRoundQueries.all(farmId), 'thresholds'] as const,
      queryFn: async ({ signal }) => {
        try {
          return await api.get(`${f(farmId)}/threshold-profiles`, { schema: thresholdProfileListResponseSchema, signal });
        } catch (e) {
          if (isApiError(e) && (e.status === 404 || e.status === 403)) return null;
          throw e;
        }
      },
      staleTime: 10 * 60_000,
    }),
};

export const nightRoundLiveEvents: Record<string, LiveEventKeys> = {
  result: (e) => (e.unitId ? [[...nightRoundQueries.all(e.farmId), 'last', e.unitId]] : [nightRoundQueries.all(e.farmId)]),
  status: (e) => [[...nightRoundQueries.all(e.farmId), 'status']],
};
