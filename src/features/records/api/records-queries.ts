import { recordsResponseSchema, type RecordSection } from '@shared/schemas/records.schema';
import { unitListResponseSchema } from '@shared/schemas/units.schema';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { api, apiUrl } from '@/lib/api-client';
import { farmKey } from '@/lib/query-client';

export interface RecordsPeriod {
  from: string;
  to: string;
  unitId?: string;
}

/** Query keys of the records feature: ['farm', farmId, 'records', …]. */
export const recordKeys = {
  all: (farmId: string) => farmKey(farmId, 'records'),
  book: (farmId: string, p: RecordsPeriod) => [...recordKeys.all(farmId), 'book', p] as const,
  units: (farmId: string) => [...recordKeys.all(farmId), 'units'] as const,
};

const farmApi = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;

export const recordQueries = {
  all: recordKeys.all,
  book: (farmId: string, p: RecordsPeriod) =>
    queryOptions({
      queryKey: recordKeys.book(farmId, p),
      queryFn: ({ signal }) =>
        api.get(`${farmApi(farmId)}/records`, {
          schema: recordsResponseSchema,
          signal,
          query: { from: p.from, to: p.to, unitId: p.unitId },
        }),
      placeholderData: keepPreviousData,
    }),
  units: (farmId: string) =>
    queryOptions({
      queryKey: recordKeys.units(farmId),
      queryFn: async ({ signal }) => (await api.get(`${farmApi(farmId)}/units`, { schema: unitListResponseSchema, signal })).units,
      staleTime: 5 * 60_000,
    }),
};

/** One section of the records as a CSV download (same period and unit). */
export function recordsCsvHref(farmId: string, section: RecordSection, p: RecordsPeriod): string {
  return apiUrl(`${farmApi(farmId)}/records.csv`, { section, from: p.from, to: p.to, unitId: p.unitId });
}
