import { durationParam, iso, numberParam, timeParam } from './params';
import type { ScenarioDefinition } from './types';

/**
 * A raceway's inflow falls to a fraction of normal (a valve left shut, a blocked screen): DO
 * falls as the fish use oxygen faster than the trickle brings it, and the water warms or cools
 * toward the air. Only raceways have an inflow; other units ignore it.
 */
export const flowCutScenario: ScenarioDefinition = {
  name: 'flow-cut',
  summary: "one raceway's inflow drops to 10–20 % at a set time",
  params: {
    at: 'when the flow drops (default +10m live, end-6h in history)',
    fraction: 'remaining fraction of normal flow (default 0.15)',
    ramp: 'how long the drop takes (default 5m)',
    restore: 'flow comes back this long after the cut (default: never)',
  },
  create(params, context, base) {
    const fallback = context.endMs !== undefined ? context.endMs - 6 * 3_600_000 : context.startMs + 10 * 60_000;
    const atMs = timeParam(params, 'at', fallback, context);
    const fraction = numberParam(params, 'fraction', 0.15, 0, 1);
    const rampMs = Math.max(1, durationParam(params, 'ramp', 5 * 60_000, 'm'));
    const restoreAfterMs = params.restore === undefined ? undefined : durationParam(params, 'restore', 0, 'h');
    const flowFactor = (ms: number): number => {
      if (ms <= atMs) return 1;
      const down = 1 - (1 - fraction) * Math.min(1, (ms - atMs) / rampMs);
      if (restoreAfterMs === undefined || ms < atMs + restoreAfterMs) return down;
      const up = Math.min(1, (ms - atMs - restoreAfterMs) / rampMs);
      return fraction + (1 - fraction) * up;
    };
    const restoreText = restoreAfterMs === undefined ? '' : `,restore=${restoreAfterMs / 3_600_000}h`;
    return {
      ...base,
      flowFactor,
      description: `flow-cut:at=${iso(atMs)},fraction=${fraction},ramp=${rampMs / 60_000}m${restoreText}`,
    };
  },
};
