import type { ScenarioDefinition } from './types';

/**
 * Load test: every probe publishes at a high rate (default every 0.1 s). Each simulated probe
 * needs its own credential: the broker uses the probeKey as clientId, and a second connection
 * with the same clientId takes over the first, so credentials cannot be reused round-robin.
 */
export const burstScenario: ScenarioDefinition = {
  name: 'burst',
  summary: 'load test: many probes at a high rate (one credential per probe)',
  params: {},
  create: (_params, _context, base) => ({ ...base, burst: true, description: 'burst' }),
};
