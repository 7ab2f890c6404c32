// Gillwise probe-simulator model: pure, deterministic pond physics (no Node APIs, imports only
// shared/ and simulator/scenarios). The demo seed uses `generateHistory` to create stored history;
// the live simulator steps the same `ProbeModel` in real time.
//
//   import { farmWeatherFor, generateHistory } from '../simulator/models';
//   const weather = farmWeatherFor({ seed: 1, farmSlug: 'harrow-bend', site: { timeZone: 'America/Chicago' } });
//   const samples = generateHistory({ probe, from, to, stepSeconds: 300, seed: 1, weather });
//
// `probe` can be an entry of the probe credential file as it is. Pass the same `weather` to every
// probe of a farm so its ponds share clouds, rain and air temperature. See docs/simulator.md.
export { DAY_MS, HOUR_MS, type FarmSite, type LocalTime, type SunTimes, createLocalClock, sunTimes } from './clock';
export {
  conductivityFromSalinity,
  doSaturationMgL,
  specificConductanceFromSalinity,
  carbonateConstants,
  carbonateFromDic,
  dicFromPh,
} from './chemistry';
export { type FarmWeatherFor, type GenerateHistoryOptions, type TimeInput, farmWeatherFor, generateHistory, toMs } from './history';
export { type ProbeModelOptions, type UnitState, ProbeModel, unsupportedQuantities } from './probe-model';
export { deriveSeed } from './random';
export { type ProbeTelemetry, probeTelemetry } from './telemetry';
export {
  type AeratorParams,
  type ProbeSpec,
  type RacewayParams,
  type TemperatureUnit,
  type UnitKind,
  type UnitParams,
  type WaterType,
  unitParams,
} from './unit-params';
export { type FarmWeatherOptions, type RainEvent, type WeatherSample, FarmWeather, createFarmWeather } from './weather';
