import { farmSchema, farmStatusResponseSchema } from '@shared/schemas/farms.schema';
import { tasksResponseSchema, treatmentSchema, withdrawalSchema } from '@shared/schemas/treatments.schema';
import { thresholdProfileListResponseSchema } from '@shared/schemas/thresholds.schema';
import { labelResolveResponseSchema, unitLabelResponseSchema, unitListResponseSchema } from '@shared/schemas/units.schema';
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api, isApiError } from '@/lib/api-client';
import { farmKey } from '@/lib/query-client';

const f = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;
const u = (farmId: string, unitId: string) => `${f(farmId)}/units/${encodeURIComponent(unitId)}`;

const unitTreatmentsSchema = z.object({ treatments: z.array(treatmentSchema), withdrawal: withdrawalSchema });

/** What the pondside screens read about the farm: units, latest probe values, settings, schedule, limits. */
export const pondsideQueries = {
  all: (farmId: string) => farmKey(farmId, 'pondside'),
  units: (farmId: string) =>
    queryOptions({
      queryKey: [...pondsideQueries.all(farmId), 'units'] as const,
      queryFn: ({ signal }) => api.get(`${f(farmId)}/units`, { schema: unitListResponseSchema, signal }),
      staleTime: 5 * 60_000,
    }),
  status: (farmId: string) =>
    queryOptions({
      queryKey: [...pondsideQueries.all(farmId), 'status'] as const,
      queryFn: ({ signal }) => api.get(`${f(farmId)}/status`, { schema: farmStatusResponseSchema, signal }),
      staleTime: 30_000,
      refetchInterval: 60_000,
    }),
  farm: (farmId: string) =>
    queryOptions({
      queryKey: [...pondsideQueries.all(farmId), 'farm'] as const,
      queryFn: ({ signal }) => api.get(f(farmId), { schema: farmSchema, signal }),
      staleTime: 10 * 60_000,
    }),
  tasks: (farmId: string) =>
    queryOptions({
      queryKey: [...pondsideQueries.all(farmId), 'tasks'] as const,
      queryFn: ({ signal }) => api.get(`${f(farmId)}/tasks`, { schema: tasksResponseSchema, signal }),
      staleTime: 60_000,
    }),
  /** The farm's threshold profiles; null while the farm has none to show (or the API is not there). */
  thresholds: (farmId: string) =>
    queryOptions({
      queryKey: [...pondsideQueries.all(farmId), 'thresholds'] as const,
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
  unitTreatments: (farmId: string, unitId: string) =>
    queryOptions({
      queryKey: [...pondsideQueries.all(farmId), 'treatments', unitId] as const,
      queryFn: ({ signal }) => api.get(`${u(farmId, unitId)}/treatments`, { schema: unitTreatmentsSchema, signal }),
      staleTime: 5 * 60_000,
    }),
  label: (farmId: string, qrLabelId: string) =>
    queryOptions({
      queryKey: [...pondsideQueries.all(farmId), 'label', qrLabelId] as const,
      queryFn: ({ signal }) =>
        api.get(`${f(farmId)}/labels/${encodeURIComponent(qrLabelId)}`, { schema: labelResolveResponseSchema, signal }),
      staleTime: Infinity,
    }),
  unitLabel: (farmId: string, unitId: string) =>
    queryOptions({
      queryKey: [...pondsideQueries.all(farmId), 'unit-label', unitId] as const,
      queryFn: ({ signal }) => api.get(`${u(farmId, unitId)}/label`, { schema: unitLabelResponseSchema, signal }),
      staleTime: Infinity,
    }),
};
