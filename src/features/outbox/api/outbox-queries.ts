import { outboxDetailSchema, outboxListSchema, type outboxKinds, type outboxStatuses } from '@shared/schemas/outbox.schema';
import { infiniteQueryOptions, queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { farmKey } from '@/lib/query-client';

export type OutboxScope = 'farm' | 'farmless';
export interface OutboxFilters {
  scope: OutboxScope;
  kind?: (typeof outboxKinds)[number];
  status?: (typeof outboxStatuses)[number];
}

/** Query keys of the outbox feature: ['farm', farmId, 'outbox', …]. */
export const outboxKeys = {
  all: (farmId: string) => farmKey(farmId, 'outbox'),
  list: (farmId: string, f: OutboxFilters) => [...outboxKeys.all(farmId), 'list', f] as const,
  detail: (farmId: string, scope: OutboxScope, id: string) => [...outboxKeys.all(farmId), 'detail', scope, id] as const,
};

const base = (farmId: string, scope: OutboxScope) => (scope === 'farm' ? `/api/farms/${encodeURIComponent(farmId)}/outbox` : '/api/outbox');

export const outboxQueries = {
  all: outboxKeys.all,
  /** Newest first; the farm's messages, or (admins) those that belong to no farm. */
  list: (farmId: string, f: OutboxFilters) =>
    infiniteQueryOptions({
      queryKey: outboxKeys.list(farmId, f),
      queryFn: ({ signal, pageParam }) =>
        api.get(base(farmId, f.scope), {
          schema: outboxListSchema,
          signal,
          query: {
            kind: f.kind,
            status: f.status,
            limit: 30,
            cursor: pageParam ?? undefined,
            ...(f.scope === 'farmless' ? { scope: 'farmless' } : {}),
          },
        }),
      initialPageParam: null as string | null,
      getNextPageParam: (last) => last.nextCursor,
      refetchInterval: 30_000,
    }),
  detail: (farmId: string, scope: OutboxScope, id: string) =>
    queryOptions({
      queryKey: outboxKeys.detail(farmId, scope, id),
      queryFn: ({ signal }) => api.get(`${base(farmId, scope)}/${encodeURIComponent(id)}`, { schema: outboxDetailSchema, signal }),
    }),
};
