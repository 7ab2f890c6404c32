import type { LiveEventKeys } from '@/lib/live-events';
import { reportKeys } from './api/keys';

/** A night alarm acknowledged or resolved shows in today's report: refresh it. */
export const reportLiveEvents: Record<string, LiveEventKeys> = {
  alert: (e) => [reportKeys.all(e.farmId)],
};
