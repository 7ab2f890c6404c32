import { describe, expect, it } from 'vitest';
import type { ProbeCredentialFile } from '../../shared/schemas/mqtt.schema';
import { DAY_MS, HOUR_MS } from './clock';
import { farmWeatherFor, generateHistory } from './history';
import type { UnitState } from './probe-model';
import type { ProbeSpec } from './unit-params';
import { FarmWeather } from './weather';

const TZ = 'America/Chicago';
// 2025-07-01 00:00 local (CDT, UTC−5).
const LOCAL_MIDNIGHT = Date.parse('2025-07-01T05:00:00Z');

const pond = (probeKey: string, extra: Partial<ProbeSpec> = {}): ProbeSpec => ({
  probeKey,
  farmSlug: 'harrow-bend',
  unitKind: 'pond',
  waterType: 'fresh',
  salinityPpt: 0.2,
  species: 'channel catfish',
  quantities: ['ph', 'dissolved_oxygen', 'water_temperature', 'aerator_running'],
  ...extra,
});

function trace(probe: ProbeSpec, weather: FarmWeather, from: number, to: number, stepSeconds = 300): Array<UnitState & { hour: number }> {
  const states: Array<UnitState & { hour: number }> = [];
  generateHistory({
    probe,
    from,
    to,
    stepSeconds,
    seed: 1,
    weather,
    onState: (s) => states.push({ ...s, hour: weather.localTime(s.atMs).hour }),
  });
  return states;
}

function hourOf<T extends { hour: number }>(rows: readonly T[], value: (row: T) => number, pick: 'max' | 'min'): number {
  let best = rows[0];
  for (const row of rows) {
    if (!best || (pick === 'max' ? value(row) > value(best) : value(row) < value(best))) best = row;
  }
  if (!best) throw new Error('no rows');
  return best.hour;
}

describe('pond diurnal physics on a clear day', () => {
  const weather = farmWeatherFor({ seed: 1, farmSlug: 'harrow-bend', site: { timeZone: TZ }, clearSky: true });

  for (const probeKey of ['pond-1', 'pond-2', 'pond-3', 'pond-4']) {
    it(`dissolved oxygen in ${probeKey} peaks in the afternoon and bottoms out near dawn`, () => {
      const day = trace(pond(probeKey), weather, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + DAY_MS);
      const peak = hourOf(day, (s) => s.doMgL, 'max');
      const trough = hourOf(day, (s) => s.doMgL, 'min');
      expect(peak).toBeGreaterThanOrEqual(12);
      expect(peak).toBeLessThanOrEqual(18);
      expect(trough).toBeGreaterThanOrEqual(3);
      expect(trough).toBeLessThanOrEqual(8);
      const max = Math.max(...day.map((s) => s.doMgL));
      const min = Math.min(...day.map((s) => s.doMgL));
      expect(max - min).toBeGreaterThan(3); // an established bloom swings DO by several mg/L
    });

    it(`pH in ${probeKey} peaks in the afternoon and bottoms out near dawn`, () => {
      const day = trace(pond(probeKey), weather, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + DAY_MS);
      const peak = hourOf(day, (s) => s.ph, 'max');
      const trough = hourOf(day, (s) => s.ph, 'min');
      expect(peak).toBeGreaterThanOrEqual(12);
      expect(peak).toBeLessThanOrEqual(18);
      expect(trough).toBeGreaterThanOrEqual(3);
      expect(trough).toBeLessThanOrEqual(8);
      const max = Math.max(...day.map((s) => s.ph));
      const min = Math.min(...day.map((s) => s.ph));
      expect(max).toBeGreaterThan(8.3);
      expect(min).toBeLessThan(7.8);
    });
  }

  it('a cycling pond swings less than an established one', () => {
    const established = trace(pond('pond-5'), weather, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + DAY_MS);
    const cycling = trace(pond('pond-5', { scenario: 'cycling' }), weather, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + DAY_MS);
    const swing = (rows: UnitState[], f: (s: UnitState) => number) => Math.max(...rows.map(f)) - Math.min(...rows.map(f));
    expect(swing(cycling, (s) => s.doMgL)).toBeLessThan(swing(established, (s) => s.doMgL) / 1.5);
    expect(swing(cycling, (s) => s.ph)).toBeLessThan(swing(established, (s) => s.ph) / 1.5);
  });

  it('pond water lags the air: warmest in the afternoon or evening, coolest in the morning, with a smaller swing', () => {
    const day = trace(pond('pond-1'), weather, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + DAY_MS);
    const waterPeak = hourOf(day, (s) => s.waterTemperatureC, 'max');
    const waterTrough = hourOf(day, (s) => s.waterTemperatureC, 'min');
    expect(waterPeak).toBeGreaterThanOrEqual(14);
    expect(waterPeak).toBeLessThanOrEqual(20);
    expect(waterTrough).toBeGreaterThanOrEqual(5);
    expect(waterTrough).toBeLessThanOrEqual(10);
    const air = day.map((s) => weather.at(s.atMs).airTemperatureC);
    const waterSwing = Math.max(...day.map((s) => s.waterTemperatureC)) - Math.min(...day.map((s) => s.waterTemperatureC));
    expect(waterSwing).toBeLessThan(Math.max(...air) - Math.min(...air));
  });
});

describe('aerators', () => {
  it('run only while DO is low at night and stop after sunrise once it has recovered', () => {
    const weather = farmWeatherFor({ seed: 1, farmSlug: 'harrow-bend', site: { timeZone: TZ } });
    const rows = trace(pond('pond-1'), weather, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + 14 * DAY_MS);
    const running = rows.filter((s) => s.aeratorRunning);
    expect(running.length).toBeGreaterThan(0);
    for (const [i, s] of rows.entries()) {
      const before = rows[i - 1];
      if (s.aeratorRunning && before && !before.aeratorRunning) expect(s.doMgL).toBeLessThan(4.2);
      if (!s.aeratorRunning && before?.aeratorRunning) {
        expect(weather.at(s.atMs).light).toBeGreaterThan(0);
        expect(s.doMgL).toBeGreaterThanOrEqual(5.4);
      }
    }
  });
});

describe('raceways', () => {
  const weather = farmWeatherFor({ seed: 1, farmSlug: 'harrow-bend', site: { timeZone: TZ } });
  const raceway = (scenario?: string): ProbeSpec => ({
    probeKey: 'rw-2',
    farmSlug: 'harrow-bend',
    unitKind: 'raceway',
    waterType: 'fresh',
    salinityPpt: 0.1,
    species: 'rainbow trout',
    quantities: ['flow', 'dissolved_oxygen', 'water_temperature', 'ph'],
    ...(scenario ? { scenario } : {}),
  });

  it('stay near the spring temperature with a small daily swing', () => {
    const rows = trace(raceway(), weather, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + 3 * DAY_MS);
    for (const s of rows) {
      expect(s.waterTemperatureC).toBeGreaterThan(11.5);
      expect(s.waterTemperatureC).toBeLessThan(14);
    }
    const ph = rows.map((s) => s.ph);
    expect(Math.max(...ph) - Math.min(...ph)).toBeLessThan(0.1);
    for (const s of rows) expect(s.flowLpm).toBeGreaterThanOrEqual(1900);
  });

  it('a flow cut lowers the raceway flow to 10–20 % and its DO falls', () => {
    const cutAt = LOCAL_MIDNIGHT + 36 * HOUR_MS;
    const rows = trace(raceway(`flow-cut:at=${new Date(cutAt).toISOString()}`), weather, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + 3 * DAY_MS);
    const before = rows.filter((s) => s.atMs < cutAt);
    const after = rows.filter((s) => s.atMs > cutAt + 3 * HOUR_MS);
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
    const flowBefore = mean(before.map((s) => s.flowLpm ?? 0));
    const flowAfter = mean(after.map((s) => s.flowLpm ?? 0));
    expect(flowAfter / flowBefore).toBeGreaterThan(0.1);
    expect(flowAfter / flowBefore).toBeLessThan(0.2);
    const doBefore = mean(before.map((s) => s.doMgL));
    const doAfter = mean(after.map((s) => s.doMgL));
    expect(doAfter).toBeLessThan(doBefore - 2);
    expect(Math.min(...before.map((s) => s.doMgL))).toBeGreaterThan(6); // trout water before the cut
  });

  it('the published flow readings show the cut too', () => {
    const cutAt = LOCAL_MIDNIGHT + 12 * HOUR_MS;
    const samples = generateHistory({
      probe: raceway(`flow-cut:at=${new Date(cutAt).toISOString()},fraction=0.12`),
      from: LOCAL_MIDNIGHT,
      to: LOCAL_MIDNIGHT + DAY_MS,
      stepSeconds: 600,
      seed: 1,
      weather,
    });
    const flow = (at: string) => samples.find((s) => s.at === at)?.values.find((v) => v.quantity === 'flow')?.value ?? Number.NaN;
    const early = flow(new Date(cutAt - HOUR_MS).toISOString());
    const late = flow(new Date(cutAt + 6 * HOUR_MS).toISOString());
    expect(late / early).toBeCloseTo(0.12, 1);
  });

  it('with no time given in history, the cut lands six hours before the end', () => {
    const to = LOCAL_MIDNIGHT + DAY_MS;
    const rows = trace(raceway('flow-cut'), weather, LOCAL_MIDNIGHT, to, 600);
    const first = rows.find((s) => (s.flowLpm ?? 0) < 1000);
    expect(first?.atMs).toBeGreaterThan(to - 6 * HOUR_MS);
    expect(first?.atMs).toBeLessThanOrEqual(to - 6 * HOUR_MS + 10 * 60_000);
  });
});

describe('brackish shrimp ponds', () => {
  const setPpt = 18;
  const rainStart = LOCAL_MIDNIGHT + 10 * DAY_MS + 14 * HOUR_MS;
  const rain = { startMs: rainStart, endMs: rainStart + 3 * HOUR_MS, totalMm: 100 }; // a tropical downpour
  const weather = new FarmWeather({ seed: 7, site: { timeZone: TZ }, rainEvents: [rain] });
  const shrimp: ProbeSpec = {
    probeKey: 'shrimp-1',
    unitKind: 'pond',
    waterType: 'brackish',
    salinityPpt: setPpt,
    species: 'whiteleg shrimp',
    quantities: ['salinity', 'dissolved_oxygen'],
  };

  it('salinity stays within ±1 ‰ of the set point except during a rain dilution, then recovers', () => {
    const rows = trace(shrimp, weather, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + 24 * DAY_MS, 1800);
    const dilutionEnd = rain.endMs + 7 * DAY_MS;
    for (const s of rows) {
      const inBand = Math.abs(s.salinityPpt - setPpt) <= 1;
      if (!inBand) {
        expect(s.salinityPpt).toBeLessThan(setPpt); // only rain takes it out of the band
        expect(s.atMs).toBeGreaterThanOrEqual(rain.startMs);
        expect(s.atMs).toBeLessThanOrEqual(dilutionEnd);
      }
    }
    const lowest = Math.min(...rows.filter((s) => s.atMs >= rain.startMs).map((s) => s.salinityPpt));
    expect(lowest).toBeLessThan(setPpt - 1); // the storm is visible
    const last = rows.at(-1);
    expect(Math.abs((last?.salinityPpt ?? 0) - setPpt)).toBeLessThanOrEqual(1);
  });

  it('evaporation creeps salinity up slowly on dry days', () => {
    const dry = new FarmWeather({ seed: 7, site: { timeZone: TZ }, rainEvents: [] });
    const rows = trace(shrimp, dry, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + 5 * DAY_MS, 3600);
    const first = rows[0]?.salinityPpt ?? 0;
    const last = rows.at(-1)?.salinityPpt ?? 0;
    expect(last).toBeGreaterThanOrEqual(first);
    expect(last - first).toBeLessThan(0.5);
    for (const s of rows) expect(s.salinityPpt).toBeGreaterThanOrEqual(setPpt);
  });
});

describe('generateHistory', () => {
  const probe = pond('pond-1', { quantities: ['ph', 'dissolved_oxygen', 'water_temperature'] });
  const site = { timeZone: TZ };

  it('gives the same samples for the same seed', () => {
    const a = generateHistory({ probe, from: LOCAL_MIDNIGHT, to: LOCAL_MIDNIGHT + DAY_MS, stepSeconds: 900, seed: 42, site });
    const b = generateHistory({ probe, from: LOCAL_MIDNIGHT, to: LOCAL_MIDNIGHT + DAY_MS, stepSeconds: 900, seed: 42, site });
    expect(a).toEqual(b);
    expect(a).toHaveLength(96);
    expect(a[0]?.at).toBe(new Date(LOCAL_MIDNIGHT).toISOString());
  });

  it('gives different samples for another seed', () => {
    const a = generateHistory({ probe, from: LOCAL_MIDNIGHT, to: LOCAL_MIDNIGHT + DAY_MS, stepSeconds: 900, seed: 1, site });
    const b = generateHistory({ probe, from: LOCAL_MIDNIGHT, to: LOCAL_MIDNIGHT + DAY_MS, stepSeconds: 900, seed: 2, site });
    expect(a).not.toEqual(b);
  });

  it('continues a longer history: a run started later agrees with it after the warm-up', () => {
    const end = LOCAL_MIDNIGHT + 14 * DAY_MS;
    const long = generateHistory({ probe, from: LOCAL_MIDNIGHT, to: end, stepSeconds: 900, seed: 1, site });
    const short = generateHistory({ probe, from: end - DAY_MS, to: end, stepSeconds: 900, seed: 1, site });
    const tail = long.slice(-short.length);
    tail.forEach((sample, i) => {
      expect(sample.at).toBe(short[i]?.at);
      sample.values.forEach((v, j) => expect(Math.abs(v.value - (short[i]?.values[j]?.value ?? Number.NaN))).toBeLessThanOrEqual(0.05));
    });
  });

  it('ponds of one farm move together: they share air temperature, cloud and rain', () => {
    const weather = farmWeatherFor({ seed: 5, farmSlug: 'harrow-bend', site });
    const run = (probeKey: string) =>
      trace(pond(probeKey), weather, LOCAL_MIDNIGHT, LOCAL_MIDNIGHT + 10 * DAY_MS, 3600).map((s) => s.waterTemperatureC);
    const a = run('pond-1');
    const b = run('pond-2');
    const mean = (xs: number[]) => xs.reduce((x, y) => x + y, 0) / xs.length;
    const ma = mean(a);
    const mb = mean(b);
    const cov = mean(a.map((x, i) => (x - ma) * ((b[i] ?? 0) - mb)));
    const sd = (xs: number[], m: number) => Math.sqrt(mean(xs.map((x) => (x - m) ** 2)));
    expect(cov / (sd(a, ma) * sd(b, mb))).toBeGreaterThan(0.95);
  });

  it('reports water temperature in °F for a probe set to F', () => {
    const samples = generateHistory({
      probe: pond('pond-1', { quantities: ['water_temperature'], temperatureUnit: 'F' }),
      from: LOCAL_MIDNIGHT,
      to: LOCAL_MIDNIGHT + 2 * HOUR_MS,
      stepSeconds: 600,
      seed: 1,
      site,
    });
    for (const s of samples) {
      expect(s.values[0]?.unit).toBe('F');
      expect(s.values[0]?.value).toBeGreaterThan(60);
      expect(s.values[0]?.value).toBeLessThan(100);
    }
  });

  it('takes a credential-file entry as it is, as the demo seed passes it', () => {
    const entry: ProbeCredentialFile['probes'][number] = {
      probeKey: 'hb-s2',
      secret: 'not-used-here',
      farmSlug: 'harrow-bend',
      unitCode: 'S2',
      unitKind: 'pond',
      waterType: 'brackish',
      salinityPpt: 15,
      species: 'whiteleg_shrimp',
      quantities: ['ph', 'water_temperature', 'dissolved_oxygen', 'specific_conductance', 'aerator_running'],
      intervalSeconds: 60,
      scenario: 'steady',
    };
    const samples = generateHistory({
      probe: entry,
      from: '2025-07-01T05:00:00Z',
      to: new Date('2025-07-01T06:00:00Z'),
      stepSeconds: 600,
      seed: 1,
      site,
    });
    expect(samples).toHaveLength(6);
    expect(samples[0]?.values.map((v) => v.quantity)).toEqual(entry.quantities);
    const sc = samples[0]?.values.find((v) => v.quantity === 'specific_conductance')?.value ?? 0;
    expect(sc).toBeGreaterThan(22); // about 24.8 mS/cm at 15 ‰
    expect(sc).toBeLessThan(28);
  });

  it('rejects a range that ends before it starts and a step that is not positive', () => {
    expect(() => generateHistory({ probe, from: LOCAL_MIDNIGHT, to: LOCAL_MIDNIGHT - 1, stepSeconds: 60, seed: 1 })).toThrow(RangeError);
    expect(() => generateHistory({ probe, from: LOCAL_MIDNIGHT, to: LOCAL_MIDNIGHT + 1, stepSeconds: 0, seed: 1 })).toThrow(RangeError);
  });
});
