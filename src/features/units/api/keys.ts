import { farmKey } from '@/lib/query-client';

/** Query keys of the units feature: ['farm', farmId, 'units', …]. Kept apart from the fetchers so live bindings stay light. */
export const unitKeys = {
  all: (farmId: string) => farmKey(farmId, 'units'),
  farmStatus: (farmId: string) => [...unitKeys.all(farmId), 'farm-status'] as const,
  profiles: (farmId: string) => [...unitKeys.all(farmId), 'threshold-profiles'] as const,
  unit: (farmId: string, unitId: string) => [...unitKeys.all(farmId), 'unit', unitId] as const,
  detail: (farmId: string, unitId: string) => [...unitKeys.unit(farmId, unitId), 'detail'] as const,
  latestResult: (farmId: string, unitId: string) => [...unitKeys.unit(farmId, unitId), 'latest-result'] as const,
  tests: (farmId: string, unitId: string, params: { from: string; analyte?: string }) =>
    [...unitKeys.unit(farmId, unitId), 'tests', params] as const,
  series: (farmId: string, unitId: string, params: { range: string; quantities: string }) =>
    [...unitKeys.unit(farmId, unitId), 'series', params] as const,
  seriesAll: (farmId: string, unitId: string) => [...unitKeys.unit(farmId, unitId), 'series'] as const,
  evaluation: (farmId: string, unitId: string) => [...unitKeys.unit(farmId, unitId), 'evaluation'] as const,
};
