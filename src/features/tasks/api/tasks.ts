import { rationSheetSchema } from '@shared/schemas/feed.schema';
import { tasksResponseSchema } from '@shared/schemas/treatments.schema';
import { queryOptions } from '@tanstack/react-query';
import type { LiveEventKeys } from '@/lib/live-events';
import { api, isApiError } from '@/lib/api-client';
import { farmKey } from '@/lib/query-client';

const f = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;

export const taskQueries = {
  all: (farmId: string) => farmKey(farmId, 'tasks'),
  /** Tests due and overdue today (farm-local), in walking order; upcoming ones after them. */
  tests: (farmId: string) =>
    queryOptions({
      queryKey: [...taskQueries.all(farmId), 'tests'] as const,
      queryFn: ({ signal }) => api.get(`${f(farmId)}/tasks`, { schema: tasksResponseSchema, signal }),
      staleTime: 60_000,
      refetchInterval: 5 * 60_000,
    }),
  /** Today's ration sheet; null when the farm has no ration sheet to show (or the API is not there). */
  rations: (farmId: string, day?: string) =>
    queryOptions({
      queryKey: [...taskQueries.all(farmId), 'rations', day ?? 'today'] as const,
      queryFn: async ({ signal }) => {
        try {
          return await api.get(`${f(farmId)}/rations`, { schema: rationSheetSchema, signal, query: { day } });
        } catch (e) {
          if (isApiError(e) && (e.status === 404 || e.status === 403)) return null;
          throw e;
        }
      },
      staleTime: 5 * 60_000,
    }),
};

/** Results and recommendations change what is due and what to feed. */
export const taskLiveEvents: Record<string, LiveEventKeys> = {
  task: (e) => [taskQueries.all(e.farmId)],
  result: (e) => [[...taskQueries.all(e.farmId), 'tests']],
  recommendation: (e) => [[...taskQueries.all(e.farmId), 'rations']],
};
