import type { SeriesDto } from '@shared/schemas/readings.schema';
import { describe, expect, it } from 'vitest';
import { bandColumns, limitBands, nitriteAsN, yRange } from './chart-data';

const at = (min: number) => new Date(Date.UTC(2026, 0, 1, 0, min)).toISOString();

function series(points: Array<[number, number, number]>, bucketSeconds = 300): SeriesDto {
  return {
    quantity: 'ph',
    unit: 'pH',
    bucketSeconds,
    readings: points.length,
    points: points.map(([m, v, suspect]) => ({ t: at(m), avg: v, min: v - 0.1, max: v + 0.1, n: 5, suspect })),
  };
}

describe('bandColumns', () => {
  it('keeps avg, min and max per bucket and marks the buckets that held suspect readings', () => {
    const cols = bandColumns(
      series([
        [0, 8, 0],
        [5, 8.2, 2],
        [10, 8.1, 0],
      ]),
    );
    expect(cols.avg).toEqual([8, 8.2, 8.1]);
    expect(cols.min[1]).toBeCloseTo(8.1);
    expect(cols.suspect).toEqual([null, 8.2, null]);
    expect(cols.suspectBuckets).toBe(1);
  });

  it('breaks the line where the probe was silent for longer than three buckets', () => {
    const cols = bandColumns(
      series([
        [0, 8, 0],
        [5, 8, 0],
        [60, 8, 0],
      ]),
    );
    expect(cols.avg).toEqual([8, 8, null, 8]);
  });

  it('converts values (°C to °F here)', () => {
    const cols = bandColumns(series([[0, 20, 0]]), (c) => (c * 9) / 5 + 32);
    expect(cols.avg).toEqual([68]);
  });
});

describe('yRange', () => {
  it('takes in a limit near the data and leaves out one far away', () => {
    const [lo, hi] = yRange([5, 6, 7], [4, 40])!;
    expect(lo).toBeLessThan(4);
    expect(hi).toBeLessThan(10);
  });

  it('takes in a far limit the data is already past (DO well below its lower limit)', () => {
    const [lo, hi] = yRange(
      [2.6, 3.1, 3.7],
      [
        { value: 6, direction: 'lower' },
        { value: 40, direction: 'upper' },
      ],
    )!;
    expect(lo).toBeLessThan(2.6);
    expect(hi).toBeGreaterThan(6);
    expect(hi).toBeLessThan(10);
  });
});

describe('limitBands', () => {
  it('reads the watch and act limits of the chart’s metrics from the profile, interpolated at the unit’s salinity', () => {
    const profile = {
      id: '1',
      farmId: '2',
      name: 'Shrimp',
      species: 'whiteleg_shrimp',
      lifeStage: null,
      unitIds: [],
      createdAt: at(0),
      updatedAt: at(0),
      rules: [
        { metric: 'do_min', watch: 4, act: 3, basis: 'mg/L DO', source: 'x' },
        {
          metric: 'nh3',
          watch: 0.1,
          act: 0.2,
          basis: 'mg/L NH3',
          source: 'y',
          bySalinity: [
            { salinityPpt: 15, act: 0.2 },
            { salinityPpt: 25, act: 0.4 },
          ],
        },
      ],
    } as const;
    expect(limitBands(profile as never, ['do_min'], null)).toEqual([
      { metric: 'do_min', direction: 'lower', watch: 4, act: 3, basis: 'mg/L DO', source: 'x' },
    ]);
    const nh3 = limitBands(profile as never, ['nh3'], 20)[0]!;
    expect(nh3.act).toBeCloseTo(0.3); // computed: halfway between 0.2 and 0.4
    expect(nh3.direction).toBe('upper');
  });
});

describe('nitriteAsN', () => {
  it('turns mg/L NO2 into mg/L NO2-N (computed from molar masses)', () => {
    expect(nitriteAsN(1, 'no2')).toBeCloseTo(0.3045, 3);
    expect(nitriteAsN(1, 'no2-n')).toBe(1);
  });
});
