// Pure history generation for the demo seed and for tests.
import type { ReadingSample } from '../../shared/schemas/mqtt.schema';
import { type ScenarioEffects, createScenario } from '../scenarios';
import type { FarmSite } from './clock';
import { ProbeModel, type UnitState } from './probe-model';
import { deriveSeed } from './random';
import type { ProbeSpec } from './unit-params';
import { FarmWeather, type FarmWeatherOptions } from './weather';

export type TimeInput = Date | number | string;

export function toMs(time: TimeInput, field: string): number {
  const ms = time instanceof Date ? time.getTime() : typeof time === 'number' ? time : Date.parse(time);
  if (!Number.isFinite(ms)) throw new RangeError(`${field} is not a valid time: ${String(time)}`);
  return ms;
}

/** Weather options of one farm; the same (seed, farmSlug, site) always gives the same weather. */
export interface FarmWeatherFor extends Omit<FarmWeatherOptions, 'seed'> {
  seed: number | string;
  farmSlug?: string;
}

/** The FarmWeather the simulator uses for a farm: shared by all of its probes, live and in history. */
export function farmWeatherFor({ seed, farmSlug, ...rest }: FarmWeatherFor): FarmWeather {
  return new FarmWeather({ ...rest, seed: deriveSeed(seed, 'farm', farmSlug ?? 'farm') });
}

export interface GenerateHistoryOptions {
  probe: ProbeSpec;
  /** First sample time (inclusive). */
  from: TimeInput;
  /** End of the range (exclusive): samples at from, from + step, … while < to. */
  to: TimeInput;
  stepSeconds: number;
  /** Run seed. Use the simulator's seed (default 1) so live readings continue the stored history. */
  seed: number | string;
  /** The farm's weather; pass one object to every probe of a farm. Default: farmWeatherFor({ seed, farmSlug: probe.farmSlug, site }). */
  weather?: FarmWeather;
  /** Farm time zone and position when no `weather` is given (default UTC, sunrise 06:30, sunset 18:30). */
  site?: Partial<FarmSite>;
  /** Scenario string or effects; default `probe.scenario`, resolved with `from`/`to` as its frame (events near the end). */
  scenario?: string | ScenarioEffects;
  warmUpHours?: number;
  /** Called with the true state behind each sample (tests, diagnostics). */
  onState?: (state: Readonly<UnitState>, sample: ReadingSample) => void;
}

const MAX_SAMPLES = 5_000_000;

/**
 * Samples a probe would have sent over [from, to), one every `stepSeconds`, from the same physics
 * the live simulator runs. Deterministic: the same options give the same samples. Each sample
 * passes `readingSampleSchema`; wrap up to 1000 of them in a payload to publish or store.
 */
export function generateHistory(options: GenerateHistoryOptions): ReadingSample[] {
  const fromMs = toMs(options.from, 'from');
  const toMsValue = toMs(options.to, 'to');
  if (!(options.stepSeconds > 0) || !Number.isFinite(options.stepSeconds)) throw new RangeError('stepSeconds must be a positive number');
  if (toMsValue < fromMs) throw new RangeError('to must not be before from');
  const stepMs = options.stepSeconds * 1000;
  const count = Math.ceil((toMsValue - fromMs) / stepMs);
  if (count > MAX_SAMPLES) throw new RangeError(`that would be ${count} samples; the limit is ${MAX_SAMPLES}`);

  const weather = options.weather ?? farmWeatherFor({ seed: options.seed, farmSlug: options.probe.farmSlug, site: options.site });
  const scenario =
    typeof options.scenario === 'object'
      ? options.scenario
      : createScenario(options.scenario ?? options.probe.scenario, {
          startMs: fromMs,
          endMs: toMsValue,
          timeZone: weather.site.timeZone,
        });
  const model = new ProbeModel({
    probe: options.probe,
    weather,
    seed: options.seed,
    startMs: fromMs,
    scenario,
    ...(options.warmUpHours === undefined ? {} : { warmUpHours: options.warmUpHours }),
  });
  const samples: ReadingSample[] = [];
  for (let i = 0; i < count; i += 1) {
    const sample = model.sampleAt(fromMs + i * stepMs);
    if (sample.values.length === 0) continue;
    samples.push(sample);
    options.onState?.(model.state, sample);
  }
  return samples;
}
