import { durationParam, iso, timeParam } from './params';
import type { ScenarioDefinition } from './types';

/**
 * The probe's radio link goes down for a while, repeatedly. The probe keeps sampling into its
 * buffer and re-sends the backlog when the link returns, so stored history has no gap.
 */
export const dropoutScenario: ScenarioDefinition = {
  name: 'dropout',
  summary: 'link down for N minutes (buffers, then re-sends)',
  params: {
    minutes: 'length of each outage (default 15m)',
    at: 'start of the first outage (default +2m)',
    every: 'time between outage starts; 0 for one outage only (default 6h)',
  },
  create(params, context, base) {
    const lengthMs = durationParam(params, 'minutes', 15 * 60_000, 'm');
    const firstMs = timeParam(params, 'at', context.startMs + 2 * 60_000, context);
    const everyMs = durationParam(params, 'every', 6 * 3_600_000, 'h');
    const offline = (ms: number): boolean => {
      if (ms < firstMs) return false;
      if (everyMs <= 0) return ms < firstMs + lengthMs;
      return (ms - firstMs) % everyMs < lengthMs;
    };
    return {
      ...base,
      offline,
      description: `dropout:minutes=${lengthMs / 60_000},at=${iso(firstMs)},every=${everyMs / 3_600_000}h`,
    };
  },
};
