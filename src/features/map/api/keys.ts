import { farmKey } from '@/lib/query-client';

/** Query keys of the farm map: ['farm', farmId, 'map', …]. Kept apart from the fetchers so live bindings stay light. */
export const mapKeys = {
  all: (farmId: string) => farmKey(farmId, 'map'),
  status: (farmId: string) => [...mapKeys.all(farmId), 'status'] as const,
  probes: (farmId: string) => [...mapKeys.all(farmId), 'probes'] as const,
};
