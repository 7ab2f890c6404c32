import { describe, expect, it } from 'vitest';
import { biomassAt, fcrBetween, fcrPeriods, stockTimeline, tQuantile975, type StockEventInput } from './stock';

const DAY = 86_400_000;
const t0 = Date.parse('2026-05-01T08:00:00Z');
const at = (days: number) => new Date(t0 + days * DAY).toISOString();
const ev = (id: string, kind: StockEventInput['kind'], days: number, over: Partial<StockEventInput> = {}): StockEventInput => ({
  id,
  kind,
  at: at(days),
  count: null,
  totalWeightKg: null,
  meanWeightG: null,
  sampleSize: null,
  sampleSdG: null,
  meanLengthCm: null,
  ...over,
});

// An invented history with round numbers (computed by hand):
// 1,000 fish stocked at 100 g; weighed at day 0 (100 g, SD 10, n 50); 50 die on day 10; weighed at day 20
// (150 g, SD 15, n 50). Fed 4 kg a day on days 1–20 = 80 kg.
const history = [
  ev('s', 'stocking', -1, { count: 1000, meanWeightG: 100 }),
  ev('w1', 'sample_weighing', 0, { meanWeightG: 100, sampleSize: 50, sampleSdG: 10, meanLengthCm: 18 }),
  ev('m', 'mortality', 10, { count: 50 }),
  ev('w2', 'sample_weighing', 20, { meanWeightG: 150, sampleSize: 50, sampleSdG: 15 }),
];
const feedings = Array.from({ length: 20 }, (_, i) => ({ fedAt: at(i + 1 - 0.5), fedKg: 4 }));

describe('the stock count and biomass', () => {
  it('counts stocked + in − out − mortalities − harvested', () => {
    const events = [
      ev('a', 'stocking', 0, { count: 1000, meanWeightG: 50 }),
      ev('b', 'transfer_in', 1, { count: 200, meanWeightG: 50 }),
      ev('c', 'transfer_out', 2, { count: 100 }),
      ev('d', 'mortality', 3, { count: 30 }),
      ev('e', 'harvest', 4, { count: 70, totalWeightKg: 4 }),
    ];
    expect(stockTimeline(events).map((p) => p.count)).toEqual([1000, 1200, 1100, 1070, 1000]);
  });

  it('takes the mean weight from the latest sample weighing and adds no growth since', () => {
    const est = biomassAt(history, at(35));
    expect(est.count).toBe(950);
    expect(est.meanWeightG).toBe(150);
    expect(est.biomassKg).toBeCloseTo(142.5, 10);
    expect(est.estimateAgeDays).toBeCloseTo(15, 10);
    expect(est.weightFrom?.eventId).toBe('w2');
    expect(est.meanLengthCm).toBe(18);
  });

  it('gives the standard error and 95 % interval of the biomass from the sample SD and size', () => {
    const est = biomassAt(history, at(21));
    // SE of mean = 15 / √50 = 2.1213 g; biomass SE = 950 × 2.1213 g = 2.0153 kg; t(49) ≈ 2.0096 (computed).
    expect(est.meanWeightSeG).toBeCloseTo(15 / Math.sqrt(50), 10);
    expect(est.biomassSeKg).toBeCloseTo((950 * 15) / Math.sqrt(50) / 1000, 10);
    expect(est.tValue).toBeCloseTo(2.0096, 3);
    expect(est.biomass95!.lowKg).toBeCloseTo(142.5 - est.tValue! * est.biomassSeKg!, 10);
  });

  it('mixes fish stocked after a weighing in by weight', () => {
    const events = [ev('a', 'stocking', 0, { count: 100, meanWeightG: 200 }), ev('b', 'stocking', 5, { count: 100, meanWeightG: 100 })];
    const est = biomassAt(events, at(6));
    expect(est.meanWeightG).toBe(150);
    expect(est.biomassKg).toBe(30);
    expect(est.weightAt).toBe(at(0));
  });

  it('knows nothing before the first event', () => {
    expect(biomassAt(history, at(-5)).count).toBe(0);
    expect(biomassAt(history, at(-5)).biomassKg).toBeNull();
  });
});

describe('Student t quantiles (published tables)', () => {
  it('reads the table and interpolates between rows', () => {
    expect(tQuantile975(1)).toBe(12.706);
    expect(tQuantile975(30)).toBe(2.042);
    expect(tQuantile975(49)).toBeGreaterThan(2.0);
    expect(tQuantile975(49)).toBeLessThan(2.021);
    expect(tQuantile975(1000)).toBe(1.96);
  });
});

describe('the feed conversion ratio between two weighings', () => {
  it('divides the feed given by the weight gained, counting the fish that died', () => {
    const p = fcrBetween(history, feedings, 'w1', 'w2')!;
    // Start 1,000 × 100 g = 100 kg; end 950 × 150 g = 142.5 kg; 50 dead at the day-10 mean of 125 g = 6.25 kg;
    // gain 48.75 kg; FCR 80 / 48.75 = 1.6410 (computed).
    expect(p.startBiomassKg).toBeCloseTo(100, 10);
    expect(p.endBiomassKg).toBeCloseTo(142.5, 10);
    expect(p.removedKg).toBeCloseTo(6.25, 10);
    expect(p.gainKg).toBeCloseTo(48.75, 10);
    expect(p.feedKg).toBe(80);
    expect(p.fcr).toBeCloseTo(1.641, 3);
  });

  it('gives the FCR uncertainty from the two weighings (delta method)', () => {
    const p = fcrBetween(history, feedings, 'w1', 'w2')!;
    // SE start 1,000 × 10/√50 g = 1.4142 kg; SE end 950 × 15/√50 g = 2.0153 kg; SE gain 2.4620 kg;
    // SE FCR = 1.6410 × 2.4620 / 48.75 = 0.0829 (computed).
    expect(p.gainSeKg).toBeCloseTo(2.462, 3);
    expect(p.fcrSe).toBeCloseTo(0.0829, 4);
    expect(p.fcr95!.low).toBeCloseTo(80 / (48.75 + 1.96 * p.gainSeKg!), 10);
    expect(p.fcr95!.high).toBeCloseTo(80 / (48.75 - 1.96 * p.gainSeKg!), 10);
  });

  it('subtracts a harvest by its weighed total', () => {
    const withHarvest = [...history, ev('h', 'harvest', 15, { count: 100, totalWeightKg: 14 })];
    const p = fcrBetween(withHarvest, feedings, 'w1', 'w2')!;
    // End 850 × 150 g = 127.5 kg; removed 6.25 + 14 = 20.25 kg; gain 47.75 kg (computed).
    expect(p.gainKg).toBeCloseTo(47.75, 10);
  });

  it('lists periods between consecutive weighings and an overall figure', () => {
    const three = [...history, ev('w3', 'sample_weighing', 40, { meanWeightG: 200, sampleSize: 40, sampleSdG: 20 })];
    const { periods, overall } = fcrPeriods(three, feedings);
    expect(periods.map((p) => [p.fromEventId, p.toEventId])).toEqual([['w1', 'w2'], ['w2', 'w3']]);
    expect(overall?.fromEventId).toBe('w1');
    expect(overall?.toEventId).toBe('w3');
  });

  it('does not give an FCR when no weight was gained', () => {
    const flat = [history[0]!, history[1]!, ev('w2', 'sample_weighing', 20, { meanWeightG: 90, sampleSize: 50, sampleSdG: 10 })];
    const p = fcrBetween(flat, feedings, 'w1', 'w2')!;
    expect(p.fcr).toBeNull();
    expect(p.note).toMatch(/No weight was gained/);
  });
});
