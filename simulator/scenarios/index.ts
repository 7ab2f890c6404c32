// Scenario registry and parser. A scenario is written `name` or `name:key=value,key=value`, e.g.
// `flow-cut:at=14:00,fraction=0.12` or `drift:phPerDay=0.05`. Pure: no Node APIs.
import { burstScenario } from './burst';
import { cyclingScenario } from './cycling';
import { driftScenario } from './drift';
import { dropoutScenario } from './dropout';
import { flatlineScenario } from './flatline';
import { flowCutScenario } from './flow-cut';
import { ScenarioParamError } from './params';
import { spikeScenario } from './spike';
import { steadyScenario } from './steady';
import { type ScenarioContext, type ScenarioDefinition, type ScenarioEffects, type ScenarioName, scenarioNames } from './types';

export { ScenarioParamError, parseDurationMs, parseTimeMs } from './params';
export * from './types';

export const scenarios: Readonly<Record<ScenarioName, ScenarioDefinition>> = {
  steady: steadyScenario,
  cycling: cyclingScenario,
  dropout: dropoutScenario,
  drift: driftScenario,
  spike: spikeScenario,
  flatline: flatlineScenario,
  burst: burstScenario,
  'flow-cut': flowCutScenario,
};

export function steadyEffects(): ScenarioEffects {
  return {
    name: 'steady',
    description: 'steady',
    algaeFactor: 1,
    flowFactor: () => 1,
    phOffset: () => 0,
    spikeProbability: 0,
    offline: () => false,
    burst: false,
  };
}

export function isScenarioName(name: string): name is ScenarioName {
  return (scenarioNames as readonly string[]).includes(name);
}

export interface ParsedScenarioText {
  name: ScenarioName;
  params: Record<string, string>;
}

/** Splits `name:key=value,...` without building effects; throws ScenarioParamError. */
export function parseScenarioText(text: string): ParsedScenarioText {
  const trimmed = text.trim();
  const colon = trimmed.indexOf(':');
  const name = (colon === -1 ? trimmed : trimmed.slice(0, colon)).trim();
  if (!isScenarioName(name)) {
    throw new ScenarioParamError(`unknown scenario ${JSON.stringify(name)}; expected one of ${scenarioNames.join(', ')}`);
  }
  const params: Record<string, string> = {};
  const rest = colon === -1 ? '' : trimmed.slice(colon + 1);
  for (const pair of rest.split(',')) {
    if (pair.trim() === '') continue;
    const eq = pair.indexOf('=');
    if (eq <= 0) throw new ScenarioParamError(`scenario parameter must be key=value; got ${JSON.stringify(pair)}`);
    const key = pair.slice(0, eq).trim();
    const definition = scenarios[name];
    if (!Object.hasOwn(definition.params, key)) {
      const known = Object.keys(definition.params);
      throw new ScenarioParamError(
        `scenario ${name} has no parameter ${JSON.stringify(key)}${known.length ? `; known: ${known.join(', ')}` : ''}`,
      );
    }
    params[key] = pair.slice(eq + 1).trim();
  }
  return { name, params };
}

/** Builds the effects of a scenario string (or returns steady for undefined); throws ScenarioParamError. */
export function createScenario(text: string | undefined, context: ScenarioContext): ScenarioEffects {
  if (text === undefined || text.trim() === '') return steadyEffects();
  const { name, params } = parseScenarioText(text);
  return scenarios[name].create(params, context, { ...steadyEffects(), name, description: name });
}
