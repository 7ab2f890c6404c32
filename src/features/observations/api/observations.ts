import { observationSchema } from '@shared/schemas/treatments.schema';
import { unitListResponseSchema } from '@shared/schemas/units.schema';
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import type { LiveEventKeys } from '@/lib/live-events';
import { farmKey } from '@/lib/query-client';

const f = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;

/** Where a new observation is POSTed (the device outbox sends it; idempotent by its client id). */
export const observationsPath = (farmId: string, unitId: string) => `${f(farmId)}/units/${encodeURIComponent(unitId)}/observations`;

export const observationQueries = {
  all: (farmId: string) => farmKey(farmId, 'observations'),
  units: (farmId: string) =>
    queryOptions({
      queryKey: [...observationQueries.all(farmId), 'units'] as const,
      queryFn: ({ signal }) => api.get(`${f(farmId)}/units`, { schema: unitListResponseSchema, signal }),
      staleTime: 60_000,
    }),
  list: (farmId: string, unitId: string) =>
    queryOptions({
      queryKey: [...observationQueries.all(farmId), 'list', unitId] as const,
      queryFn: ({ signal }) =>
        api.get(observationsPath(farmId, unitId), { schema: z.object({ observations: z.array(observationSchema) }), signal }),
      staleTime: 30_000,
    }),
};

/** An observation makes the server send a 'task' event (closer watch changes the schedule). */
export const observationLiveEvents: Record<string, LiveEventKeys> = {
  task: (e) => [observationQueries.all(e.farmId)],
};
