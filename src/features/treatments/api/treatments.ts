import { createTreatmentSchema, treatmentSchema, type CreateTreatment } from '@shared/schemas/treatments.schema';
import { unitListResponseSchema } from '@shared/schemas/units.schema';
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import type { LiveEventKeys } from '@/lib/live-events';
import { farmKey } from '@/lib/query-client';

const f = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;

export const treatmentQueries = {
  all: (farmId: string) => farmKey(farmId, 'treatments'),
  units: (farmId: string) =>
    queryOptions({
      queryKey: [...treatmentQueries.all(farmId), 'units'] as const,
      queryFn: ({ signal }) => api.get(`${f(farmId)}/units`, { schema: unitListResponseSchema, signal }),
      staleTime: 5 * 60_000,
    }),
  /** Every treatment on the farm with its withdrawal status. */
  farm: (farmId: string) =>
    queryOptions({
      queryKey: [...treatmentQueries.all(farmId), 'farm'] as const,
      queryFn: ({ signal }) => api.get(`${f(farmId)}/treatments`, { schema: z.object({ treatments: z.array(treatmentSchema) }), signal }),
      staleTime: 60_000,
    }),
};

/** POST /api/farms/:farmId/units/:unitId/treatments (needs a connection: a treatment has no client id to resend safely). */
export function useLogTreatment(farmId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ unitId, body }: { unitId: string; body: CreateTreatment }) =>
      api.post(`${f(farmId)}/units/${encodeURIComponent(unitId)}/treatments`, createTreatmentSchema.parse(body), {
        schema: treatmentSchema,
      }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: treatmentQueries.all(farmId) }),
  });
}

export const treatmentLiveEvents: Record<string, LiveEventKeys> = {
  task: (e) => [[...treatmentQueries.all(e.farmId), 'farm']],
};
