import { numberParam } from './params';
import type { ScenarioDefinition } from './types';

/**
 * A new or restarted pond whose biofilter and plankton bloom are still establishing: less algae,
 * so smaller DO and pH swings. TAN is measured with kits, not probes, so it is not published here.
 */
export const cyclingScenario: ScenarioDefinition = {
  name: 'cycling',
  summary: 'new pond still cycling: thin bloom, smaller DO and pH swings',
  params: { algae: 'algae as a fraction of an established pond (default 0.35)' },
  create(params, _context, base) {
    const algae = numberParam(params, 'algae', 0.35, 0, 2);
    return { ...base, algaeFactor: algae, description: `cycling:algae=${algae}` };
  },
};
