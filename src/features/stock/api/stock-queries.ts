import { createStockEventResponseSchema, farmStockSchema, unitStockSchema, type CreateStockEvent } from '@shared/schemas/stock.schema';
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { stockKeys } from './keys';

const farmApi = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;

/** Query options of the stock feature (keys in ./keys). */
export const stockQueries = {
  all: stockKeys.all,
  farm: (farmId: string) =>
    queryOptions({
      queryKey: stockKeys.farm(farmId),
      queryFn: ({ signal }) => api.get(`${farmApi(farmId)}/stock`, { schema: farmStockSchema, signal }),
    }),
  unit: (farmId: string, unitId: string) =>
    queryOptions({
      queryKey: stockKeys.unit(farmId, unitId),
      queryFn: ({ signal }) => api.get(`${farmApi(farmId)}/units/${encodeURIComponent(unitId)}/stock`, { schema: unitStockSchema, signal }),
    }),
};

/** Record a stocking, transfer, mortality, sample weighing or harvest; every unit's figures may change (a transfer touches two). */
export function useCreateStockEvent(farmId: string, unitId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateStockEvent) =>
      api.post(`${farmApi(farmId)}/units/${encodeURIComponent(unitId)}/stock-events`, body, { schema: createStockEventResponseSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: stockKeys.all(farmId) }),
  });
}
