import { farmStatusResponseSchema } from '@shared/schemas/farms.schema';
import { probeListResponseSchema } from '@shared/schemas/probes.schema';
import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ProbePoint } from '../lib/geo';
import { mapKeys } from './keys';

const farmPath = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;

export function fetchFarmStatus(farmId: string, signal?: AbortSignal) {
  return api.get(`${farmPath(farmId)}/status`, { schema: farmStatusResponseSchema, signal });
}

export async function fetchProbePoints(farmId: string, signal?: AbortSignal): Promise<ProbePoint[]> {
  const { probes } = await api.get(`${farmPath(farmId)}/probes`, { schema: probeListResponseSchema, signal });
  return probes.filter((p) => p.active).map((p) => ({ id: p.id, unitId: p.unitId, label: p.label, health: p.health.state }));
}

/** Query options of the farm map (keys in ./keys). */
export const mapQueries = {
  all: mapKeys.all,
  status: (farmId: string) =>
    queryOptions({
      queryKey: mapKeys.status(farmId),
      queryFn: ({ signal }) => fetchFarmStatus(farmId, signal),
      // Live events refresh it; the interval is the fallback when the event stream is down.
      refetchInterval: 60_000,
      staleTime: 15_000,
    }),
  probes: (farmId: string) =>
    queryOptions({
      queryKey: mapKeys.probes(farmId),
      queryFn: ({ signal }) => fetchProbePoints(farmId, signal),
      refetchInterval: 120_000,
      staleTime: 60_000,
    }),
};
