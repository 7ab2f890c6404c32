import { morningReportSchema } from '@shared/schemas/reports.schema';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { reportKeys } from './keys';

const path = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}/reports/morning`;

export const reportQueries = {
  all: reportKeys.all,
  /** The report of a farm-local day (null: today's); built on request when the scheduled one is not stored yet. */
  morning: (farmId: string, day: string | null) =>
    queryOptions({
      queryKey: reportKeys.morning(farmId, day),
      queryFn: ({ signal }) => api.get(path(farmId), { schema: morningReportSchema, signal, query: { day: day ?? undefined } }),
      staleTime: 60_000,
      placeholderData: keepPreviousData,
    }),
};
