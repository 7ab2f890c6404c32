import { onCallResponseSchema } from '@shared/schemas/alerts.schema';
import { farmSchema } from '@shared/schemas/farms.schema';
import { feedingTableSchema } from '@shared/schemas/feed.schema';
import { personSchema } from '@shared/schemas/people.schema';
import { calibrationListResponseSchema, maintenanceWindowListResponseSchema, probeListResponseSchema } from '@shared/schemas/probes.schema';
import { thresholdProfileListResponseSchema } from '@shared/schemas/thresholds.schema';
import { flowListResponseSchema, unitLabelResponseSchema, unitListResponseSchema } from '@shared/schemas/units.schema';
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { farmApi, setupKeys } from './keys';

const tablesSchema = z.object({ tables: z.array(feedingTableSchema) });
const peopleSchema = z.object({ people: z.array(personSchema) });

/** Query options of the setup feature (keys in ./keys). */
export const setupQueries = {
  all: setupKeys.all,
  farm: (farmId: string) =>
    queryOptions({
      queryKey: setupKeys.farm(farmId),
      queryFn: ({ signal }) => api.get(farmApi(farmId), { schema: farmSchema, signal }),
      staleTime: 5 * 60_000,
    }),
  units: (farmId: string) =>
    queryOptions({
      queryKey: setupKeys.units(farmId),
      queryFn: async ({ signal }) => (await api.get(`${farmApi(farmId)}/units`, { schema: unitListResponseSchema, signal })).units,
    }),
  flows: (farmId: string, unitId: string) =>
    queryOptions({
      queryKey: setupKeys.flows(farmId, unitId),
      queryFn: ({ signal }) =>
        api.get(`${farmApi(farmId)}/units/${encodeURIComponent(unitId)}/flows`, {
          schema: flowListResponseSchema,
          signal,
          query: { limit: 20 },
        }),
    }),
  label: (farmId: string, unitId: string) =>
    queryOptions({
      queryKey: setupKeys.label(farmId, unitId),
      queryFn: ({ signal }) =>
        api.get(`${farmApi(farmId)}/units/${encodeURIComponent(unitId)}/label`, { schema: unitLabelResponseSchema, signal }),
      staleTime: Infinity,
    }),
  probes: (farmId: string) =>
    queryOptions({
      queryKey: setupKeys.probes(farmId),
      queryFn: async ({ signal }) => (await api.get(`${farmApi(farmId)}/probes`, { schema: probeListResponseSchema, signal })).probes,
      refetchInterval: 60_000,
    }),
  calibrations: (farmId: string, probeId: string) =>
    queryOptions({
      queryKey: setupKeys.calibrations(farmId, probeId),
      queryFn: async ({ signal }) =>
        (
          await api.get(`${farmApi(farmId)}/probes/${encodeURIComponent(probeId)}/calibrations`, {
            schema: calibrationListResponseSchema,
            signal,
          })
        ).calibrations,
    }),
  windows: (farmId: string, probeId: string) =>
    queryOptions({
      queryKey: setupKeys.windows(farmId, probeId),
      queryFn: async ({ signal }) =>
        (
          await api.get(`${farmApi(farmId)}/probes/${encodeURIComponent(probeId)}/maintenance-windows`, {
            schema: maintenanceWindowListResponseSchema,
            signal,
          })
        ).windows,
    }),
  thresholds: (farmId: string) =>
    queryOptions({
      queryKey: setupKeys.thresholds(farmId),
      queryFn: ({ signal }) => api.get(`${farmApi(farmId)}/threshold-profiles`, { schema: thresholdProfileListResponseSchema, signal }),
    }),
  feedingTables: (farmId: string) =>
    queryOptions({
      queryKey: setupKeys.feedingTables(farmId),
      queryFn: async ({ signal }) => (await api.get(`${farmApi(farmId)}/feeding-tables`, { schema: tablesSchema, signal })).tables,
    }),
  onCall: (farmId: string) =>
    queryOptions({
      queryKey: setupKeys.onCall(farmId),
      queryFn: ({ signal }) => api.get(`${farmApi(farmId)}/on-call`, { schema: onCallResponseSchema, signal }),
    }),
  people: (farmId: string) =>
    queryOptions({
      queryKey: setupKeys.people(farmId),
      queryFn: async ({ signal }) => (await api.get(`${farmApi(farmId)}/people`, { schema: peopleSchema, signal })).people,
    }),
};
