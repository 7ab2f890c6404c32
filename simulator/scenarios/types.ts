// Scenario contracts. A scenario changes the physics (algae, flow), the sensor (drift, spikes,
// flatline) or the link (dropout, burst rate); all effects are pure functions of model time.
import type { Quantity } from '../../shared/schemas/mqtt.schema';

export const scenarioNames = ['steady', 'cycling', 'dropout', 'drift', 'spike', 'flatline', 'burst', 'flow-cut'] as const;
export type ScenarioName = (typeof scenarioNames)[number];

export interface ScenarioContext {
  /** Start of the run or of the generated history, ms since the epoch. */
  startMs: number;
  /** End of generated history; scenarios place their event near the end when they know it. */
  endMs?: number;
  /** Farm time zone, for times written as HH:MM. */
  timeZone?: string;
}

export interface ScenarioEffects {
  name: ScenarioName;
  /** The scenario written out with every parameter, e.g. `flow-cut:at=2025-06-01T14:00:00.000Z,fraction=0.15`. */
  description: string;
  /** Multiplies the unit's algae (photosynthesis and plankton respiration). */
  algaeFactor: number;
  /** Multiplies a raceway's inflow. */
  flowFactor(ms: number): number;
  /** Added to the true pH by the sensor. */
  phOffset(ms: number): number;
  /** Chance that a sample carries a single-sample spike. */
  spikeProbability: number;
  /** The sensor of this quantity reads a stuck value from `fromMs` on. */
  flatline?: { quantity: Quantity; fromMs: number };
  /** The probe's link is down (it keeps sampling into its buffer). */
  offline(ms: number): boolean;
  /** Load-test mode: high publish rate, every probe needs its own credential. */
  burst: boolean;
}

export type ScenarioParams = Readonly<Record<string, string>>;

export interface ScenarioDefinition {
  name: ScenarioName;
  summary: string;
  /** Parameter names with a one-line description each (shown in --help and docs). */
  params: Readonly<Record<string, string>>;
  create(params: ScenarioParams, context: ScenarioContext, base: ScenarioEffects): ScenarioEffects;
}
