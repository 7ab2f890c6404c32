import { alertDetailResponseSchema, alertListResponseSchema, alertSummaryResponseSchema } from '@shared/schemas/alerts.schema';
import { personSchema } from '@shared/schemas/people.schema';
import { unitListResponseSchema } from '@shared/schemas/units.schema';
import { infiniteQueryOptions, queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api, isApiError } from '@/lib/api-client';
import { alertKeys, type AlertListFilters } from './keys';

export const alertsPath = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}/alerts`;

const PAGE = 50;

export interface Person {
  id: string;
  name: string;
  role: string;
}

const peopleResponse = z.object({ people: z.array(personSchema) });

/** Query options of the alerts feature (keys in ./keys). */
export const alertQueries = {
  all: alertKeys.all,
  list: (farmId: string, filters: AlertListFilters) =>
    infiniteQueryOptions({
      queryKey: alertKeys.list(farmId, filters),
      queryFn: ({ signal, pageParam }) =>
        api.get(alertsPath(farmId), {
          schema: alertListResponseSchema,
          signal,
          query: { state: filters.state, unitId: filters.unitId, kind: filters.kind, limit: PAGE, cursor: pageParam ?? undefined },
        }),
      initialPageParam: null as string | null,
      getNextPageParam: (last) => last.nextCursor,
      staleTime: 15_000,
      refetchInterval: 60_000,
    }),
  detail: (farmId: string, alertId: string) =>
    queryOptions({
      queryKey: alertKeys.detail(farmId, alertId),
      queryFn: ({ signal }) =>
        api.get(`${alertsPath(farmId)}/${encodeURIComponent(alertId)}`, { schema: alertDetailResponseSchema, signal }),
    }),
  summary: (farmId: string) =>
    queryOptions({
      queryKey: alertKeys.summary(farmId),
      queryFn: ({ signal }) => api.get(`${alertsPath(farmId)}/summary`, { schema: alertSummaryResponseSchema, signal }),
      staleTime: 15_000,
    }),
  /** Active people of the farm an alert can be given to (managers and admins may read the list; others get none). */
  people: (farmId: string) =>
    queryOptions({
      queryKey: alertKeys.people(farmId),
      queryFn: async ({ signal }): Promise<Person[]> => {
        try {
          const { people } = await api.get(`/api/farms/${encodeURIComponent(farmId)}/people`, { schema: peopleResponse, signal });
          return people.filter((p) => p.active).map((p) => ({ id: p.userId, name: p.name, role: p.role }));
        } catch (e) {
          if (isApiError(e) && (e.status === 403 || e.status === 404)) return [];
          throw e;
        }
      },
      staleTime: 5 * 60_000,
    }),
};

/** The farm's units, for the unit filter (code and name only). */
export const unitOptionsQuery = (farmId: string) =>
  queryOptions({
    queryKey: [...alertKeys.all(farmId), 'unit-options'] as const,
    queryFn: async ({ signal }) => {
      const { units } = await api.get(`/api/farms/${encodeURIComponent(farmId)}/units`, { schema: unitListResponseSchema, signal });
      return units.map((u) => ({ id: u.id, code: u.code, name: u.name }));
    },
    staleTime: 5 * 60_000,
  });
