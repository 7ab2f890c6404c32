import { auditListResponseSchema } from '@shared/schemas/audit.schema';
import { infiniteQueryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { farmKey } from '@/lib/query-client';

export interface AuditFilters {
  entity?: string;
  actorId?: string;
  /** ISO instants */
  from?: string;
  to?: string;
}

/** Query keys of the audit feature: ['farm', farmId, 'audit', …]. */
export const auditKeys = {
  all: (farmId: string) => farmKey(farmId, 'audit'),
  list: (farmId: string, f: AuditFilters) => [...auditKeys.all(farmId), 'list', f] as const,
};

const PAGE = 30;

export const auditQueries = {
  all: auditKeys.all,
  /** Newest first, paged by cursor ("older" pages). */
  list: (farmId: string, f: AuditFilters) =>
    infiniteQueryOptions({
      queryKey: auditKeys.list(farmId, f),
      queryFn: ({ signal, pageParam }) =>
        api.get(`/api/farms/${encodeURIComponent(farmId)}/audit`, {
          schema: auditListResponseSchema,
          signal,
          query: { entity: f.entity, actorId: f.actorId, from: f.from, to: f.to, limit: PAGE, cursor: pageParam ?? undefined },
        }),
      initialPageParam: null as string | null,
      getNextPageParam: (last) => last.nextCursor,
    }),
};
