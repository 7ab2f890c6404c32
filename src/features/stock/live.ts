import type { LiveEventKeys } from '@/lib/live-events';
import { stockKeys } from './api/keys';

/** A new recommendation follows a stock change (biomass moved): refresh the stock figures too. */
export const stockLiveEvents: Record<string, LiveEventKeys> = {
  recommendation: (e) => [stockKeys.all(e.farmId)],
};
