import { numberParam } from './params';
import type { ScenarioDefinition } from './types';

/** Electrical noise or a bubble on a sensor: now and then one sample of one quantity jumps. */
export const spikeScenario: ScenarioDefinition = {
  name: 'spike',
  summary: 'occasional single-sample spikes on one quantity',
  params: { probability: 'chance per sample (default 0.02)' },
  create(params, _context, base) {
    const probability = numberParam(params, 'probability', 0.02, 0, 1);
    return { ...base, spikeProbability: probability, description: `spike:probability=${probability}` };
  },
};
