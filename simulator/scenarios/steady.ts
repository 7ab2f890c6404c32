import type { ScenarioDefinition } from './types';

/** The farm on an ordinary day: physics only, no sensor or link faults. */
export const steadyScenario: ScenarioDefinition = {
  name: 'steady',
  summary: 'ordinary operation: physics only',
  params: {},
  create: (_params, _context, base) => base,
};
