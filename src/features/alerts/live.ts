import type { LiveEventKeys } from '@/lib/live-events';
import { alertKeys } from './api/keys';

/** An alert opened, acknowledged, assigned or resolved (or a unit's status changed): refresh every alert list. */
export const alertLiveEvents: Record<string, LiveEventKeys> = {
  alert: (e) => [alertKeys.all(e.farmId)],
  status: (e) => [alertKeys.summary(e.farmId)],
};
