import type { LiveEventKeys } from '@/lib/live-events';
import { mapKeys } from './api/keys';

/**
 * What each live event makes stale on the map (src/app/live-bindings.ts registers these): a status,
 * alert or result event recolours the units; new readings refresh the latest values and probe dots.
 */
export const mapLiveEvents: Record<string, LiveEventKeys> = {
  status: (e) => [mapKeys.status(e.farmId)],
  alert: (e) => [mapKeys.status(e.farmId)],
  result: (e) => [mapKeys.status(e.farmId)],
  readings: (e) => [mapKeys.all(e.farmId)],
};
