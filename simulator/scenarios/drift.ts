import { DAY_MS } from '../models/clock';
import { iso, numberParam, timeParam } from './params';
import type { ScenarioDefinition } from './types';

/** A fouling pH electrode: its reading drifts away from the true pH at a steady rate. */
export const driftScenario: ScenarioDefinition = {
  name: 'drift',
  summary: 'pH sensor offset grows steadily (default +0.02 per day)',
  params: { phPerDay: 'drift rate, pH units per day (default 0.02)', from: 'when the drift starts (default: the start)' },
  create(params, context, base) {
    const rate = numberParam(params, 'phPerDay', 0.02, -2, 2);
    const fromMs = timeParam(params, 'from', context.startMs, context);
    return {
      ...base,
      phOffset: (ms) => (ms <= fromMs ? 0 : ((ms - fromMs) / DAY_MS) * rate),
      description: `drift:phPerDay=${rate},from=${iso(fromMs)}`,
    };
  },
};
