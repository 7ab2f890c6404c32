import type { SeriesDto } from '@shared/schemas/readings.schema';
import type { ThresholdProfileDto, ThresholdRuleDto } from '@shared/schemas/thresholds.schema';
import { limitsAt } from '@shared/schemas/thresholds.schema';

/** Columns for uPlot: time (s), avg, min, max, and avg again only where a bucket held suspect readings. */
export interface BandColumns {
  x: number[];
  avg: (number | null)[];
  min: (number | null)[];
  max: (number | null)[];
  suspect: (number | null)[];
  suspectBuckets: number;
}

function median(values: number[]): number {
  if (values.length === 0) return 0;
  const s = [...values].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

/**
 * Turns a series into uPlot columns. A gap much longer than the bucket (or the usual spacing of raw
 * readings) gets a null row, so the line breaks where the probe was silent instead of bridging it.
 */
export function bandColumns(series: SeriesDto, convert: (v: number) => number = (v) => v): BandColumns {
  const out: BandColumns = { x: [], avg: [], min: [], max: [], suspect: [], suspectBuckets: 0 };
  const times = series.points.map((p) => Date.parse(p.t) / 1000);
  const deltas = times.slice(1).map((t, i) => t - times[i]!);
  const step = series.bucketSeconds > 0 ? series.bucketSeconds : median(deltas);
  const gap = Math.max(step * 3, 1);
  series.points.forEach((p, i) => {
    const t = times[i]!;
    if (i > 0 && t - times[i - 1]! > gap) {
      out.x.push((t + times[i - 1]!) / 2);
      out.avg.push(null);
      out.min.push(null);
      out.max.push(null);
      out.suspect.push(null);
    }
    out.x.push(t);
    out.avg.push(convert(p.avg));
    out.min.push(convert(p.min));
    out.max.push(convert(p.max));
    const bad = p.suspect > 0;
    out.suspect.push(bad ? convert(p.avg) : null);
    if (bad) out.suspectBuckets++;
  });
  return out;
}

export interface LimitBand {
  metric: string;
  direction: 'upper' | 'lower';
  watch: number | null;
  act: number | null;
  basis: string;
  source: string;
}

/** The unit profile's limits for the given metrics, at the unit's salinity. */
export function limitBands(
  profile: ThresholdProfileDto | null | undefined,
  metrics: readonly string[],
  salinityPpt: number | null,
): LimitBand[] {
  if (!profile) return [];
  return profile.rules
    .filter((r) => metrics.includes(r.metric))
    .map((r: ThresholdRuleDto) => {
      const { watch, act } = limitsAt(r, salinityPpt);
      const direction: LimitBand['direction'] = r.metric.endsWith('_min') ? 'lower' : 'upper';
      return { metric: r.metric, direction, watch, act, basis: r.basis, source: r.source };
    });
}

/**
 * The y range of a chart: the data, plus any limit close enough to matter (within one data span) or
 * one the data is already past, so a far-off limit does not squash the line but a crossed one shows.
 */
export function yRange(
  values: readonly (number | null)[],
  limits: ReadonlyArray<number | { value: number; direction: 'upper' | 'lower' }>,
  minSpan = 0.1,
): [number, number] | null {
  const data = values.filter((v): v is number => v !== null && Number.isFinite(v));
  const ls = limits.map((l) => (typeof l === 'number' ? { value: l, direction: null } : l));
  if (data.length === 0 && ls.length === 0) return null;
  let lo = data.length ? Math.min(...data) : Math.min(...ls.map((l) => l.value));
  let hi = data.length ? Math.max(...data) : Math.max(...ls.map((l) => l.value));
  const span = Math.max(hi - lo, minSpan);
  const dataLo = lo;
  const dataHi = hi;
  for (const { value, direction } of ls) {
    const near = value >= dataLo - span && value <= dataHi + span;
    const crossed = (direction === 'lower' && dataLo < value) || (direction === 'upper' && dataHi > value);
    if (near || crossed) {
      lo = Math.min(lo, value);
      hi = Math.max(hi, value);
    }
  }
  const pad = Math.max((hi - lo) * 0.08, minSpan / 2);
  return [lo - pad, hi + pad];
}

/** The limits of the bands as yRange takes them. */
export function limitValues(limits: readonly LimitBand[]): Array<{ value: number; direction: 'upper' | 'lower' }> {
  return limits.flatMap((l) => [l.watch, l.act].filter((v): v is number => v !== null).map((value) => ({ value, direction: l.direction })));
}

/** Whether any limit line falls inside the y range (the key lists the zones only then). */
export function limitsVisible(limits: readonly LimitBand[], range: readonly [number, number]): boolean {
  return limitValues(limits).some(({ value }) => value >= range[0] && value <= range[1]);
}

export interface SeriesStats {
  min: number;
  max: number;
  latest: number;
}

export function seriesStats(cols: BandColumns): SeriesStats | null {
  const mins = cols.min.filter((v): v is number => v !== null);
  const maxs = cols.max.filter((v): v is number => v !== null);
  const avgs = cols.avg.filter((v): v is number => v !== null);
  if (!avgs.length) return null;
  return { min: Math.min(...mins), max: Math.max(...maxs), latest: avgs[avgs.length - 1]! };
}

/** Nitrite in mg/L NO2-N whatever the kit reported (NO2 → NO2-N by molar mass, 14.007/46.005). */
export function nitriteAsN(value: number, basis: string): number {
  return basis === 'no2' ? (value * 14.007) / 46.005 : value;
}
