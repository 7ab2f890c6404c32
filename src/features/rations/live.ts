import type { LiveEventKeys } from '@/lib/live-events';
import { rationKeys } from './api/keys';

/** A recommendation recomputed or decided, or a new free-ammonia result: the ration sheets are stale. */
export const rationLiveEvents: Record<string, LiveEventKeys> = {
  recommendation: (e) => [rationKeys.all(e.farmId)],
  result: (e) => [rationKeys.all(e.farmId)],
};
