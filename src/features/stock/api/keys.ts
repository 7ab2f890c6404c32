import { farmKey } from '@/lib/query-client';

/** Query keys of the stock feature: ['farm', farmId, 'stock', …]. */
export const stockKeys = {
  all: (farmId: string) => farmKey(farmId, 'stock'),
  farm: (farmId: string) => [...stockKeys.all(farmId), 'farm'] as const,
  unit: (farmId: string, unitId: string) => [...stockKeys.all(farmId), 'unit', unitId] as const,
};
