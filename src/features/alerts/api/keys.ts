import { farmKey } from '@/lib/query-client';

export type AlertStateFilter = 'open' | 'acknowledged' | 'resolved' | 'active';

export interface AlertListFilters {
  state: AlertStateFilter;
  unitId?: string;
  kind?: string;
}

/** Query keys of the alerts feature: ['farm', farmId, 'alerts', …]. Kept apart from the fetchers so live bindings stay light. */
export const alertKeys = {
  all: (farmId: string) => farmKey(farmId, 'alerts'),
  lists: (farmId: string) => [...alertKeys.all(farmId), 'list'] as const,
  list: (farmId: string, filters: AlertListFilters) => [...alertKeys.lists(farmId), filters] as const,
  detail: (farmId: string, alertId: string) => [...alertKeys.all(farmId), 'detail', alertId] as const,
  summary: (farmId: string) => [...alertKeys.all(farmId), 'summary'] as const,
  people: (farmId: string) => [...alertKeys.all(farmId), 'people'] as const,
};
