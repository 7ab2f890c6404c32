// Farm weather: air temperature, light, cloud, wind and rain as pure functions of time. One
// FarmWeather is shared by every probe of a farm, so its ponds warm, cool and cloud over together.
import { DAY_MS, HOUR_MS, type FarmSite, type LocalTime, assertTimeZone, clearSkyLight, createLocalClock, sunTimes } from './clock';
import { deriveSeed, smoothNoise, unitHash } from './random';

export interface RainEvent {
  startMs: number;
  endMs: number;
  /** Rain depth over the whole event, mm. */
  totalMm: number;
}

export interface FarmWeatherOptions {
  /** Same seed, same weather: ponds of one farm share it; history and live runs agree. */
  seed: number | string;
  site?: Partial<FarmSite>;
  /** Mean air temperature, °C (default 25: a warm-season farm). */
  meanAirTemperatureC?: number;
  /** Difference between a clear day's maximum and minimum, °C (default 10). */
  dailyAirRangeC?: number;
  /** Amplitude of the slow (multi-day) weather drift of the mean, °C (default 3). */
  weatherDriftC?: number;
  /** No clouds and no rain: a run of clear days (tests, demos). */
  clearSky?: boolean;
  /** Mean number of rainy days per week when rain is random (default 0.8). */
  rainDaysPerWeek?: number;
  /** Use exactly these rain events instead of random ones. */
  rainEvents?: readonly RainEvent[];
}

export interface WeatherSample {
  atMs: number;
  local: LocalTime;
  sunriseHour: number;
  sunsetHour: number;
  airTemperatureC: number;
  /** Mean air temperature of the day around this instant (no diurnal part), °C. */
  airDailyMeanC: number;
  /** Light at the water surface relative to an overhead clear sky, 0–1. */
  light: number;
  /** 0 clear – 1 overcast. */
  cloudCover: number;
  windMs: number;
  rainMmPerHour: number;
}

const CHANNEL = {
  drift: 'air-drift',
  cloud: 'cloud',
  cloudFast: 'cloud-fast',
  wind: 'wind',
  rain: 'rain',
  rainStart: 'rain-start',
  rainLength: 'rain-length',
  rainDepth: 'rain-depth',
} as const;

const clamp = (value: number, min: number, max: number): number => Math.min(max, Math.max(min, value));

/**
 * Diurnal air-temperature shape, −1 at the minimum (half an hour before sunrise) to +1 at the
 * maximum (2.5 h after solar noon): a half-cosine rising, a longer half-cosine falling.
 */
export function diurnalShape(hour: number, minHour: number, maxHour: number): number {
  if (hour >= minHour && hour <= maxHour) return -Math.cos((Math.PI * (hour - minHour)) / (maxHour - minHour));
  const h = hour < minHour ? hour + 24 : hour;
  return Math.cos((Math.PI * (h - maxHour)) / (minHour + 24 - maxHour));
}

export class FarmWeather {
  readonly site: FarmSite;
  readonly seed: number;
  private readonly clock: (ms: number) => LocalTime;
  private readonly meanC: number;
  private readonly rangeC: number;
  private readonly driftC: number;
  private readonly clearSky: boolean;
  private readonly rainProbabilityPerDay: number;
  private readonly fixedRain: readonly RainEvent[] | undefined;
  private readonly seeds: Record<keyof typeof CHANNEL, number>;

  constructor(options: FarmWeatherOptions) {
    const timeZone = options.site?.timeZone ?? 'UTC';
    assertTimeZone(timeZone);
    this.site = { ...options.site, timeZone };
    this.seed = deriveSeed(options.seed, 'weather');
    this.clock = createLocalClock(timeZone);
    this.meanC = options.meanAirTemperatureC ?? 25;
    this.rangeC = options.dailyAirRangeC ?? 10;
    this.driftC = options.weatherDriftC ?? 3;
    this.clearSky = options.clearSky ?? false;
    this.rainProbabilityPerDay = clamp((options.rainDaysPerWeek ?? 0.8) / 7, 0, 1);
    this.fixedRain = options.rainEvents ? [...options.rainEvents].sort((a, b) => a.startMs - b.startMs) : undefined;
    const seeds = {} as Record<keyof typeof CHANNEL, number>;
    for (const key of Object.keys(CHANNEL) as Array<keyof typeof CHANNEL>) seeds[key] = deriveSeed(this.seed, CHANNEL[key]);
    this.seeds = seeds;
  }

  localTime(ms: number): LocalTime {
    return this.clock(ms);
  }

  /** Rain events overlapping [fromMs, toMs). */
  rainEventsBetween(fromMs: number, toMs: number): RainEvent[] {
    if (this.fixedRain) return this.fixedRain.filter((e) => e.endMs > fromMs && e.startMs < toMs);
    if (this.clearSky) return [];
    const events: RainEvent[] = [];
    for (let day = Math.floor(fromMs / DAY_MS) - 1; day <= Math.floor(toMs / DAY_MS); day += 1) {
      const event = this.randomRainOn(day);
      if (event && event.endMs > fromMs && event.startMs < toMs) events.push(event);
    }
    return events;
  }

  private randomRainOn(day: number): RainEvent | undefined {
    if (unitHash(this.seeds.rain, day) >= this.rainProbabilityPerDay) return undefined;
    const startMs = day * DAY_MS + Math.floor(unitHash(this.seeds.rainStart, day) * DAY_MS);
    const hours = 1 + 4 * unitHash(this.seeds.rainLength, day);
    const depth = unitHash(this.seeds.rainDepth, day);
    return { startMs, endMs: startMs + hours * HOUR_MS, totalMm: 6 + 70 * depth * depth };
  }

  /** Rain rate now and how strongly rain (within ±2 h) overcasts the sky. */
  private rainAt(ms: number): { rate: number; overcast: number } {
    let rate = 0;
    let overcast = 0;
    for (const e of this.rainEventsBetween(ms - 2 * HOUR_MS, ms + 2 * HOUR_MS)) {
      if (ms >= e.startMs && ms < e.endMs) rate += e.totalMm / ((e.endMs - e.startMs) / HOUR_MS);
      const distanceH = ms < e.startMs ? (e.startMs - ms) / HOUR_MS : ms > e.endMs ? (ms - e.endMs) / HOUR_MS : 0;
      overcast = Math.max(overcast, 1 - distanceH / 2);
    }
    return { rate, overcast };
  }

  at(ms: number): WeatherSample {
    const local = this.clock(ms);
    const sun = sunTimes(this.site, local);
    const tHours = ms / HOUR_MS;
    const rain = this.rainAt(ms);
    const cloudNoise = 0.6 * smoothNoise(this.seeds.cloud, tHours, 14) + 0.25 * smoothNoise(this.seeds.cloudFast, tHours, 3);
    const cloudCover = this.clearSky ? 0 : clamp(Math.max(0.15 + cloudNoise, 0.95 * rain.overcast), 0, 1);
    const light = clearSkyLight(sun, local.hour) * (1 - 0.75 * cloudCover);
    const airDailyMeanC = this.meanC + this.driftC * smoothNoise(this.seeds.drift, tHours, 60) - 1.5 * cloudCover;
    const minHour = sun.sunriseHour - 0.5;
    const maxHour = (sun.sunriseHour + sun.sunsetHour) / 2 + 2.5;
    const amplitude = (this.rangeC / 2) * (1 - 0.6 * cloudCover);
    const airTemperatureC = airDailyMeanC + amplitude * diurnalShape(local.hour, minHour, maxHour) - (rain.rate > 0 ? 1.5 : 0);
    const windMs = this.clearSky ? 2 : clamp(2.5 + 1.8 * smoothNoise(this.seeds.wind, tHours, 8), 0.3, 12);
    return {
      atMs: ms,
      local,
      sunriseHour: sun.sunriseHour,
      sunsetHour: sun.sunsetHour,
      airTemperatureC,
      airDailyMeanC,
      light,
      cloudCover,
      windMs,
      rainMmPerHour: rain.rate,
    };
  }
}

export function createFarmWeather(options: FarmWeatherOptions): FarmWeather {
  return new FarmWeather(options);
}
