import { rationSheetSchema } from '@shared/schemas/feed.schema';
import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { rationKeys } from './keys';

export const farmApi = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;

/** Query options of the rations feature (keys in ./keys). */
export const rationQueries = {
  all: rationKeys.all,
  /** The ration sheet of a farm-local day (null = the farm's today). */
  sheet: (farmId: string, day: string | null) =>
    queryOptions({
      queryKey: rationKeys.sheet(farmId, day),
      queryFn: ({ signal }) =>
        api.get(`${farmApi(farmId)}/rations`, { schema: rationSheetSchema, signal, query: { day: day ?? undefined } }),
      staleTime: 15_000,
    }),
};
