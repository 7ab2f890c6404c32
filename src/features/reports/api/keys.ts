import { farmKey } from '@/lib/query-client';

/** Query keys of the reports feature: ['farm', farmId, 'reports', …]. */
export const reportKeys = {
  all: (farmId: string) => farmKey(farmId, 'reports'),
  morning: (farmId: string, day: string | null) => [...reportKeys.all(farmId), 'morning', day ?? 'today'] as const,
};
