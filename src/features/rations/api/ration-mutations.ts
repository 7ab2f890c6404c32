import {
  acceptDayResponseSchema,
  recommendationSchema,
  recomputeResponseSchema,
  type OverrideRecommendation,
} from '@shared/schemas/feed.schema';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { rationKeys } from './keys';
import { farmApi } from './ration-queries';

/** Every decision changes the sheet of its day (and maybe others'): refresh all of the farm's ration sheets. */
function useRationMutation<V, R>(farmId: string, fn: (v: V) => Promise<R>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSettled: () => queryClient.invalidateQueries({ queryKey: rationKeys.all(farmId) }),
  });
}

const recPath = (farmId: string, id: string, action: 'accept' | 'override') =>
  `${farmApi(farmId)}/recommendations/${encodeURIComponent(id)}/${action}`;

export function useAcceptRecommendation(farmId: string) {
  return useRationMutation(farmId, ({ recommendationId }: { recommendationId: string }) =>
    api.post(recPath(farmId, recommendationId, 'accept'), {}, { schema: recommendationSchema }),
  );
}

export function useOverrideRecommendation(farmId: string) {
  return useRationMutation(farmId, ({ recommendationId, ...body }: { recommendationId: string } & OverrideRecommendation) =>
    api.post(recPath(farmId, recommendationId, 'override'), body, { schema: recommendationSchema }),
  );
}

/** Accept every pending recommendation of the day, or only those of `unitIds`. */
export function useAcceptDay(farmId: string) {
  return useRationMutation(farmId, (body: { day: string; unitIds?: string[] }) =>
    api.post(`${farmApi(farmId)}/rations/accept`, body, { schema: acceptDayResponseSchema }),
  );
}

/** Work the day's recommendations out again now (decided ones keep their decision). */
export function useRecompute(farmId: string) {
  return useRationMutation(farmId, (body: { day: string }) =>
    api.post(`${farmApi(farmId)}/rations/recompute`, body, { schema: recomputeResponseSchema }),
  );
}
