import { farmKey } from '@/lib/query-client';

/** Query keys of the setup feature: ['farm', farmId, 'setup', …]. */
export const setupKeys = {
  all: (farmId: string) => farmKey(farmId, 'setup'),
  farm: (farmId: string) => [...setupKeys.all(farmId), 'farm'] as const,
  units: (farmId: string) => [...setupKeys.all(farmId), 'units'] as const,
  flows: (farmId: string, unitId: string) => [...setupKeys.units(farmId), 'flows', unitId] as const,
  label: (farmId: string, unitId: string) => [...setupKeys.units(farmId), 'label', unitId] as const,
  probes: (farmId: string) => [...setupKeys.all(farmId), 'probes'] as const,
  calibrations: (farmId: string, probeId: string) => [...setupKeys.probes(farmId), 'calibrations', probeId] as const,
  windows: (farmId: string, probeId: string) => [...setupKeys.probes(farmId), 'windows', probeId] as const,
  thresholds: (farmId: string) => [...setupKeys.all(farmId), 'thresholds'] as const,
  feedingTables: (farmId: string) => [...setupKeys.all(farmId), 'feeding-tables'] as const,
  onCall: (farmId: string) => [...setupKeys.all(farmId), 'on-call'] as const,
  people: (farmId: string) => [...setupKeys.all(farmId), 'people'] as const,
};

export const farmApi = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;
