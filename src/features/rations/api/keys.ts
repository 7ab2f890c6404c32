import { farmKey } from '@/lib/query-client';

/** Query keys of the rations feature: ['farm', farmId, 'rations', …]. */
export const rationKeys = {
  all: (farmId: string) => farmKey(farmId, 'rations'),
  sheet: (farmId: string, day: string | null) => [...rationKeys.all(farmId), 'sheet', day ?? 'today'] as const,
};
