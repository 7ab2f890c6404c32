import { farmKey } from '@/lib/query-client';

/** Query keys of the imports feature: ['farm', farmId, 'imports', …]. */
export const importKeys = {
  all: (farmId: string) => farmKey(farmId, 'imports'),
  status: (farmId: string, importId: string, rejectsOffset: number) =>
    [...importKeys.all(farmId), 'status', importId, rejectsOffset] as const,
  units: (farmId: string) => [...importKeys.all(farmId), 'units'] as const,
};
