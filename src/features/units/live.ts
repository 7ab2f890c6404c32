import type { LiveEvent, LiveEventKeys } from '@/lib/live-events';
import { unitKeys } from './api/keys';

const unitOr = (e: LiveEvent, pick: (farmId: string, unitId: string) => readonly unknown[]) =>
  typeof e.unitId === 'string' ? [pick(e.farmId, e.unitId)] : [unitKeys.all(e.farmId)];

/**
 * What each live event makes stale in the units feature (src/app/live-bindings.ts registers these):
 * a result refreshes the unit's results and ammonia; readings its charts and latest values; a
 * status or alert change its evaluation and the farm status.
 */
export const unitLiveEvents: Record<string, LiveEventKeys> = {
  result: (e) => [...unitOr(e, unitKeys.unit), unitKeys.farmStatus(e.farmId)],
  readings: (e) => [...unitOr(e, unitKeys.seriesAll), unitKeys.farmStatus(e.farmId)],
  status: (e) => [...unitOr(e, unitKeys.evaluation), unitKeys.farmStatus(e.farmId)],
  alert: (e) => [...unitOr(e, unitKeys.evaluation), unitKeys.farmStatus(e.farmId)],
};
