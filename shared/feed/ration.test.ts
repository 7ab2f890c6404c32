import { describe, expect, it } from 'vitest';
import { epochDayNumber, isFeedingDay, matchFeedingRow, nextFeedingDay, planRation, type FeedTableInput, type RationInput } from './ration';
import { defaultFeedRule } from './rule';

// Channel catfish food fish in ponds (husbandry §2; extension sources, published; 18.3–21 °C band a product decision).
const catfish: FeedTableInput = {
  name: 'Channel catfish, food fish in ponds',
  source: 'extension sources (published)',
  maxKgPerHaPerDay: 134.5,
  rows: [
    { minTemperatureC: -5, maxTemperatureC: 7.2, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 0, daysPerWeek: 0, note: 'no feeding below 7.2 °C' },
    { minTemperatureC: 7.2, maxTemperatureC: 12.8, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 1, daysPerWeek: 2 },
    { minTemperatureC: 12.8, maxTemperatureC: 18.3, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 1, daysPerWeek: 3.5 },
    { minTemperatureC: 18.3, maxTemperatureC: 21, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 1.5, daysPerWeek: 7 },
    { minTemperatureC: 21, maxTemperatureC: 40, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 3, daysPerWeek: 7 },
  ],
};
// Nile tilapia by size (husbandry §2: size table from memory; stops feeding below 17.2 °C, SRAC 283, published).
const tilapia: FeedTableInput = {
  name: 'Nile tilapia by size',
  source: 'from memory; SRAC 283',
  maxKgPerHaPerDay: null,
  rows: [
    { minTemperatureC: 17.2, maxTemperatureC: 40, minWeightG: 0, maxWeightG: 20, pctBodyWeightPerDay: 5, daysPerWeek: 7 },
    { minTemperatureC: 17.2, maxTemperatureC: 40, minWeightG: 20, maxWeightG: 100, pctBodyWeightPerDay: 3.5, daysPerWeek: 7 },
    { minTemperatureC: 17.2, maxTemperatureC: 40, minWeightG: 100, maxWeightG: 1e6, pctBodyWeightPerDay: 2.25, daysPerWeek: 7 },
  ],
};
const trout: FeedTableInput = {
  name: 'Rainbow trout, hatchery constant',
  source: 'Haskell 1959; Piper et al. 1982',
  maxKgPerHaPerDay: null,
  rows: [
    { minTemperatureC: 0, maxTemperatureC: 19, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: -1, daysPerWeek: 7 },
    { minTemperatureC: 19, maxTemperatureC: 21, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: -0.5, daysPerWeek: 7, note: 'half ration' },
    { minTemperatureC: 21, maxTemperatureC: 40, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 0, daysPerWeek: 0, note: 'stop feeding above 21 °C' },
  ],
};

const base = (over: Partial<RationInput>): RationInput => ({
  day: '2026-06-10',
  species: 'channel_catfish',
  table: catfish,
  temperatureC: 25,
  temperatureBasis: '24-h probe mean',
  biomassKg: 1000,
  meanWeightG: 400,
  meanLengthCm: null,
  areaM2: 100_000,
  ...over,
});

describe('the feeding-day schedule', () => {
  it('feeds every day at 7 days a week and never at 0', () => {
    expect(isFeedingDay({ day: '2026-06-10', daysPerWeek: 7 })).toBe(true);
    expect(isFeedingDay({ day: '2026-06-10', daysPerWeek: 0 })).toBe(false);
  });

  it('feeds every other day at 3.5 days a week, on odd day numbers', () => {
    const days = Array.from({ length: 14 }, (_, i) => new Date(Date.UTC(2026, 5, 1 + i)).toISOString().slice(0, 10));
    const fed = days.filter((day) => isFeedingDay({ day, daysPerWeek: 3.5 }));
    expect(fed).toHaveLength(7);
    for (const day of fed) expect(epochDayNumber(day) % 2).toBe(1);
    expect(isFeedingDay({ day: days[0]!, daysPerWeek: 3.5 })).not.toBe(isFeedingDay({ day: days[1]!, daysPerWeek: 3.5 }));
  });

  it('feeds twice in every seven days, 3 or 4 days apart, at 2 days a week', () => {
    const days = Array.from({ length: 28 }, (_, i) => new Date(Date.UTC(2026, 5, 1 + i)).toISOString().slice(0, 10));
    const fed = days.filter((day) => isFeedingDay({ day, daysPerWeek: 2 })).map(epochDayNumber);
    expect(fed).toHaveLength(8);
    for (let i = 1; i < fed.length; i++) expect([3, 4]).toContain(fed[i]! - fed[i - 1]!);
  });

  it('names the next feeding day', () => {
    const day = ['2026-06-10', '2026-06-11'].find((d) => !isFeedingDay({ day: d, daysPerWeek: 3.5 }))!;
    const next = nextFeedingDay({ day, daysPerWeek: 3.5 });
    expect(epochDayNumber(next!) - epochDayNumber(day)).toBe(1);
  });
});

describe('the planned ration from the catfish temperature bands (extension sources, published)', () => {
  it('plans 3 % of body weight at 21 °C and above', () => {
    const plan = planRation(base({ temperatureC: 21 }), defaultFeedRule);
    expect(plan.status).toBe('ok');
    expect(plan.pctBodyWeightPerDay).toBe(3);
    expect(plan.plannedKg).toBe(30);
  });

  it('plans 1 % every other day between 12.8 and 18.3 °C', () => {
    const [feedDay, restDay] = ['2026-06-10', '2026-06-11'].sort((a) => (isFeedingDay({ day: a, daysPerWeek: 3.5 }) ? -1 : 1));
    const on = planRation(base({ temperatureC: 15, day: feedDay! }), defaultFeedRule);
    const off = planRation(base({ temperatureC: 15, day: restDay! }), defaultFeedRule);
    expect(on.status).toBe('ok');
    expect(on.plannedKg).toBe(10);
    expect(off.status).toBe('not_feeding_day');
    expect(off.plannedKg).toBe(0);
    expect(off.text).toMatch(/rest day/);
  });

  it('plans 1.5 % between 18.3 and 21 °C (product decision)', () => {
    expect(planRation(base({ temperatureC: 19.5 }), defaultFeedRule).plannedKg).toBe(15);
  });

  it('does not feed below 7.2 °C', () => {
    const plan = planRation(base({ temperatureC: 6 }), defaultFeedRule);
    expect(plan.status).toBe('out_of_band');
    expect(plan.plannedKg).toBe(0);
    expect(plan.text).toMatch(/no feeding below 7\.2 °C/);
  });

  it('caps the ration at 134.5 kg/ha/day times the pond area', () => {
    // 10,000 kg at 3 % = 300 kg; 1.54 ha × 134.5 = 207.13 kg (computed).
    const plan = planRation(base({ biomassKg: 10_000, areaM2: 15_400 }), defaultFeedRule);
    expect(plan.uncappedKg).toBeCloseTo(300, 6);
    expect(plan.capKg).toBeCloseTo(207.13, 2);
    expect(plan.capApplied).toBe(true);
    expect(plan.plannedKg).toBe(207.1);
  });
});

describe('the planned ration for tilapia and trout', () => {
  it('scales the tilapia ration linearly from none at 17.2 °C to full at 29 °C (product decision)', () => {
    const full = planRation(base({ species: 'nile_tilapia', table: tilapia, temperatureC: 30, meanWeightG: 180 }), defaultFeedRule);
    const half = planRation(base({ species: 'nile_tilapia', table: tilapia, temperatureC: 23.1, meanWeightG: 180 }), defaultFeedRule);
    expect(full.pctBodyWeightPerDay).toBe(2.25);
    expect(half.temperatureFactor).toBeCloseTo(0.5, 6);
    expect(half.pctBodyWeightPerDay).toBeCloseTo(1.125, 6);
  });

  it('picks the tilapia row by mean weight and stops below 17.2 °C', () => {
    expect(planRation(base({ species: 'nile_tilapia', table: tilapia, temperatureC: 30, meanWeightG: 24 }), defaultFeedRule).pctBodyWeightPerDay).toBe(3.5);
    const cold = planRation(base({ species: 'nile_tilapia', table: tilapia, temperatureC: 16, meanWeightG: 24 }), defaultFeedRule);
    expect(cold.status).toBe('out_of_band');
    expect(cold.text).toMatch(/below 17\.2 °C/);
  });

  it('uses the hatchery constant for trout: 3 × 1.2 × 0.1 × 100 / L', () => {
    // HC = 36 (computed); at L = 24 cm → 1.5 % BW; half ration at 19–21 °C.
    const plan = planRation(base({ species: 'rainbow_trout', table: trout, temperatureC: 14, meanLengthCm: 24, biomassKg: 500, areaM2: 90 }), defaultFeedRule);
    expect(plan.method).toBe('hatchery_constant');
    expect(plan.pctBodyWeightPerDay).toBeCloseTo(1.5, 10);
    expect(plan.plannedKg).toBe(7.5);
    const warm = planRation(base({ species: 'rainbow_trout', table: trout, temperatureC: 20, meanLengthCm: 24, biomassKg: 500, areaM2: 90 }), defaultFeedRule);
    expect(warm.pctBodyWeightPerDay).toBeCloseTo(0.75, 10);
  });

  it('matches the published hatchery-constant check in inches: FCR 1.2, ΔL 0.04 in/day, L 6 in → 2.4 % BW', () => {
    // husbandry §2 check (computed): HC 14.4, 2.4 % BW. The row carries its own inputs in inches.
    const inches: FeedTableInput = { ...trout, rows: [{ ...trout.rows[0]!, fcr: 1.2, dailyLengthGainCm: 0.04 }] };
    const plan = planRation(base({ species: 'rainbow_trout', table: inches, temperatureC: 12, meanLengthCm: 6 }), defaultFeedRule);
    expect(plan.pctBodyWeightPerDay).toBeCloseTo(2.4, 10);
  });

  it('asks for a length when the trout length is unknown', () => {
    const plan = planRation(base({ species: 'rainbow_trout', table: trout, temperatureC: 14, meanLengthCm: null }), defaultFeedRule);
    expect(plan.status).toBe('no_plan');
    expect(plan.text).toMatch(/mean length/);
  });

  it('stops trout feeding above 21 °C', () => {
    const plan = planRation(base({ species: 'rainbow_trout', table: trout, temperatureC: 22, meanLengthCm: 24 }), defaultFeedRule);
    expect(plan.status).toBe('out_of_band');
    expect(plan.text).toMatch(/stop feeding above 21 °C/);
  });
});

describe('matching a feeding-table row', () => {
  it('includes the lower bound of a band and excludes the upper', () => {
    expect(matchFeedingRow({ rows: catfish.rows, temperatureC: 18.3, meanWeightG: 400 })?.index).toBe(3);
    expect(matchFeedingRow({ rows: catfish.rows, temperatureC: 18.29, meanWeightG: 400 })?.index).toBe(2);
  });

  it('needs a mean weight only when the table depends on size', () => {
    expect(matchFeedingRow({ rows: catfish.rows, temperatureC: 25, meanWeightG: null })?.index).toBe(4);
    expect(matchFeedingRow({ rows: tilapia.rows, temperatureC: 25, meanWeightG: null })).toBeNull();
  });
});
