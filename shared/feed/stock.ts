// Stock arithmetic for a culture unit: fish count from the stock events, mean weight from the latest
// sample weighing (no growth is assumed between weighings), the biomass with its sampling uncertainty,
// and the feed conversion ratio between weighings. Pure and isomorphic.

export type StockKind = 'stocking' | 'transfer_in' | 'transfer_out' | 'mortality' | 'sample_weighing' | 'harvest';

export type StockEventInput = {
  id: string;
  kind: StockKind;
  /** ISO time. */
  at: string;
  count: number | null;
  totalWeightKg: number | null;
  meanWeightG: number | null;
  sampleSize: number | null;
  sampleSdG: number | null;
  meanLengthCm: number | null;
};

export type FeedingInput = { fedAt: string; fedKg: number };

export type StockPoint = {
  eventId: string;
  kind: StockKind;
  at: string;
  count: number;
  meanWeightG: number | null;
  /** Standard error of the mean weight (g), from the sample SD and size; null without an SD. */
  meanWeightSeG: number | null;
  /** Degrees of freedom behind the standard error (sample size − 1). */
  df: number | null;
  biomassKg: number | null;
  biomassSeKg: number | null;
  meanLengthCm: number | null;
  /** When the resident fish were last weighed (or stocked): the age of the weight estimate runs from here. */
  weightAt: string | null;
  weightFrom: { eventId: string; kind: StockKind; at: string } | null;
  lengthAt: string | null;
};

// Student's t, two-sided 95 % (0.975 quantile), by degrees of freedom (published tables).
const T975: Array<[number, number]> = [
  [1, 12.706], [2, 4.303], [3, 3.182], [4, 2.776], [5, 2.571], [6, 2.447], [7, 2.365], [8, 2.306], [9, 2.262], [10, 2.228],
  [11, 2.201], [12, 2.179], [13, 2.16], [14, 2.145], [15, 2.131], [16, 2.12], [17, 2.11], [18, 2.101], [19, 2.093], [20, 2.086],
  [21, 2.08], [22, 2.074], [23, 2.069], [24, 2.064], [25, 2.06], [26, 2.056], [27, 2.052], [28, 2.048], [29, 2.045], [30, 2.042],
  [40, 2.021], [60, 2.0], [120, 1.98],
];
export const Z975 = 1.96;

/** The 0.975 quantile of Student's t (interpolated in 1/df between table rows; 1.96 beyond 120). */
export function tQuantile975(df: number): number {
  if (!(df >= 1)) return Number.NaN;
  if (df > 120) return Z975;
  const exact = T975.find(([d]) => d === df);
  if (exact) return exact[1];
  for (let i = 1; i < T975.length; i++) {
    const [d1, t1] = T975[i - 1]!;
    const [d2, t2] = T975[i]!;
    if (df > d1 && df < d2) {
      const w = (1 / df - 1 / d1) / (1 / d2 - 1 / d1);
      return t1 + w * (t2 - t1);
    }
  }
  return Z975;
}

const sortEvents = (events: StockEventInput[]) => [...events].sort((a, b) => Date.parse(a.at) - Date.parse(b.at));

const weightOf = (e: StockEventInput, n: number): number | null => {
  if (e.meanWeightG !== null && e.meanWeightG > 0) return e.meanWeightG;
  if (e.totalWeightKg !== null && n > 0) return (e.totalWeightKg * 1000) / n;
  return null;
};

/**
 * The unit's state after each stock event, in time order. Stocking and transfers in mix their fish
 * in by weight; mortalities, harvests and transfers out remove fish at the current mean weight; a
 * sample weighing resets the mean weight (and length) to the sample's.
 */
export function stockTimeline(events: StockEventInput[]): StockPoint[] {
  let count = 0;
  let mean: number | null = null;
  let se: number | null = null;
  let df: number | null = null;
  let length: number | null = null;
  let weightAt: string | null = null;
  let lengthAt: string | null = null;
  let weightFrom: StockPoint['weightFrom'] = null;
  const out: StockPoint[] = [];
  for (const e of sortEvents(events)) {
    const n = Math.max(0, e.count ?? 0);
    switch (e.kind) {
      case 'stocking':
      case 'transfer_in': {
        const w = weightOf(e, n);
        const addedSe = e.sampleSdG !== null && e.sampleSize !== null && e.sampleSize >= 2 ? e.sampleSdG / Math.sqrt(e.sampleSize) : null;
        if (w !== null && n > 0) {
          if (mean === null || count === 0) {
            mean = w;
            se = addedSe;
            df = addedSe !== null ? e.sampleSize! - 1 : null;
            weightAt = e.at;
          } else {
            const total = count + n;
            // The mean of the mix; its standard error combines both parts weighted by their share.
            const seOld: number = se ?? 0;
            const seNew: number = addedSe ?? 0;
            se = se === null && addedSe === null ? null : Math.sqrt((count * seOld) ** 2 + (n * seNew) ** 2) / total;
            mean = (count * mean + n * w) / total;
            // The resident fish's weight is as old as it was; keep the older date.
            weightAt = weightAt && Date.parse(weightAt) < Date.parse(e.at) ? weightAt : e.at;
          }
          weightFrom = { eventId: e.id, kind: e.kind, at: e.at };
        }
        if (e.meanLengthCm !== null) {
          length = length === null || count === 0 ? e.meanLengthCm : (count * length + n * e.meanLengthCm) / (count + n);
          lengthAt = lengthAt ?? e.at;
        }
        count += n;
        break;
      }
      case 'mortality':
      case 'harvest':
      case 'transfer_out':
        count = Math.max(0, count - n);
        break;
      case 'sample_weighing': {
        const w = weightOf(e, e.sampleSize ?? 0);
        if (w !== null) {
          mean = w;
          se = e.sampleSdG !== null && e.sampleSize !== null && e.sampleSize >= 2 ? e.sampleSdG / Math.sqrt(e.sampleSize) : null;
          df = se !== null ? e.sampleSize! - 1 : null;
          weightAt = e.at;
          weightFrom = { eventId: e.id, kind: e.kind, at: e.at };
        }
        if (e.meanLengthCm !== null) {
          length = e.meanLengthCm;
          lengthAt = e.at;
        }
        break;
      }
    }
    out.push({
      eventId: e.id,
      kind: e.kind,
      at: e.at,
      count,
      meanWeightG: mean,
      meanWeightSeG: se,
      df,
      biomassKg: mean !== null ? (count * mean) / 1000 : null,
      biomassSeKg: mean !== null && se !== null ? (count * se) / 1000 : null,
      meanLengthCm: length,
      weightAt,
      weightFrom,
      lengthAt,
    });
  }
  return out;
}

export type BiomassEstimate = {
  count: number;
  meanWeightG: number | null;
  meanWeightSeG: number | null;
  sampleSize: number | null;
  biomassKg: number | null;
  biomassSeKg: number | null;
  /** 95 % interval of the biomass from the sampling error of the mean weight (the count is taken as exact). */
  biomass95: { lowKg: number; highKg: number } | null;
  tValue: number | null;
  meanLengthCm: number | null;
  lengthAt: string | null;
  weightAt: string | null;
  weightFrom: StockPoint['weightFrom'];
  /** Days since the weight was measured; no growth is added for them. */
  estimateAgeDays: number | null;
};

/** The biomass estimate at `at` (the state after the last event at or before it). */
export function biomassAt(events: StockEventInput[], at: string): BiomassEstimate {
  const t = Date.parse(at);
  const timeline = stockTimeline(events.filter((e) => Date.parse(e.at) <= t));
  const last = timeline[timeline.length - 1];
  if (!last) {
    return { count: 0, meanWeightG: null, meanWeightSeG: null, sampleSize: null, biomassKg: null, biomassSeKg: null, biomass95: null, tValue: null, meanLengthCm: null, lengthAt: null, weightAt: null, weightFrom: null, estimateAgeDays: null };
  }
  const tValue = last.df !== null && last.df >= 1 ? tQuantile975(last.df) : null;
  const biomass95 =
    last.biomassKg !== null && last.biomassSeKg !== null && tValue !== null
      ? { lowKg: Math.max(0, last.biomassKg - tValue * last.biomassSeKg), highKg: last.biomassKg + tValue * last.biomassSeKg }
      : null;
  return {
    count: last.count,
    meanWeightG: last.meanWeightG,
    meanWeightSeG: last.meanWeightSeG,
    sampleSize: last.df !== null ? last.df + 1 : null,
    biomassKg: last.biomassKg,
    biomassSeKg: last.biomassSeKg,
    biomass95,
    tValue,
    meanLengthCm: last.meanLengthCm,
    lengthAt: last.lengthAt,
    weightAt: last.weightAt,
    weightFrom: last.weightFrom,
    estimateAgeDays: last.weightAt ? (t - Date.parse(last.weightAt)) / 86_400_000 : null,
  };
}

export type FcrPeriod = {
  fromEventId: string;
  toEventId: string;
  from: string;
  to: string;
  days: number;
  feedKg: number;
  feedings: number;
  startBiomassKg: number;
  endBiomassKg: number;
  /** Fish that left (dead, harvested, moved out) valued at the mean weight interpolated to when they left. */
  removedKg: number;
  /** Fish that came in (stocked, moved in) at their own weight. */
  addedKg: number;
  gainKg: number;
  gainSeKg: number | null;
  fcr: number | null;
  fcrSe: number | null;
  /** 95 % interval (normal approximation on the gain); high is null when the gain's interval reaches 0. */
  fcr95: { low: number; high: number | null } | null;
  note: string | null;
};

/**
 * FCR between two sample weighings: feed given ÷ weight gained, with weight gained = end biomass −
 * start biomass + weight that left − weight that came in. Its uncertainty comes from the sampling
 * error of the two mean weights (independent samples; feed and counts taken as exact), by the delta
 * method: SE(FCR) = FCR × SE(gain) / gain.
 */
export function fcrBetween(events: StockEventInput[], feedings: FeedingInput[], fromEventId: string, toEventId: string): FcrPeriod | null {
  const sorted = sortEvents(events);
  const timeline = stockTimeline(sorted);
  const i1 = timeline.findIndex((p) => p.eventId === fromEventId);
  const i2 = timeline.findIndex((p) => p.eventId === toEventId);
  if (i1 < 0 || i2 <= i1) return null;
  const p1 = timeline[i1]!;
  const p2 = timeline[i2]!;
  const w1 = sorted[i1]!;
  const w2 = sorted[i2]!;
  if (p1.meanWeightG === null || p2.meanWeightG === null || p1.biomassKg === null || p2.biomassKg === null) return null;
  const t1 = Date.parse(p1.at);
  const t2 = Date.parse(p2.at);
  // The sample means of the two weighings, interpolated in time for fish leaving in between.
  const m1 = weightOf(w1, w1.sampleSize ?? 0) ?? p1.meanWeightG;
  const m2 = weightOf(w2, w2.sampleSize ?? 0) ?? p2.meanWeightG;
  const meanAt = (t: number) => m1 + ((m2 - m1) * (t - t1)) / Math.max(1, t2 - t1);
  let removedKg = 0;
  let addedKg = 0;
  for (const e of sorted.slice(i1 + 1, i2)) {
    const n = Math.max(0, e.count ?? 0);
    const t = Date.parse(e.at);
    if (e.kind === 'mortality') removedKg += (n * meanAt(t)) / 1000;
    else if (e.kind === 'harvest' || e.kind === 'transfer_out') removedKg += e.totalWeightKg ?? (n * meanAt(t)) / 1000;
    else if (e.kind === 'stocking' || e.kind === 'transfer_in') addedKg += e.totalWeightKg ?? (n * (weightOf(e, n) ?? meanAt(t))) / 1000;
  }
  const inPeriod = feedings.filter((f) => {
    const t = Date.parse(f.fedAt);
    return t > t1 && t <= t2;
  });
  const feedKg = inPeriod.reduce((s, f) => s + f.fedKg, 0);
  const gainKg = p2.biomassKg - p1.biomassKg + removedKg - addedKg;
  const gainSeKg = p1.biomassSeKg !== null && p2.biomassSeKg !== null ? Math.sqrt(p1.biomassSeKg ** 2 + p2.biomassSeKg ** 2) : null;
  let fcr: number | null = null;
  let fcrSe: number | null = null;
  let fcr95: FcrPeriod['fcr95'] = null;
  let note: string | null = null;
  if (gainKg <= 0) {
    note = 'No weight was gained between these weighings; FCR is not defined';
  } else if (feedKg <= 0) {
    note = 'No feeding was recorded between these weighings';
  } else {
    fcr = feedKg / gainKg;
    if (gainSeKg !== null) {
      fcrSe = (fcr * gainSeKg) / gainKg;
      const lowGain = gainKg - Z975 * gainSeKg;
      fcr95 = { low: feedKg / (gainKg + Z975 * gainSeKg), high: lowGain > 0 ? feedKg / lowGain : null };
    } else {
      note = 'A weighing without a standard deviation: no uncertainty can be given';
    }
  }
  return {
    fromEventId,
    toEventId,
    from: p1.at,
    to: p2.at,
    days: (t2 - t1) / 86_400_000,
    feedKg,
    feedings: inPeriod.length,
    startBiomassKg: p1.biomassKg,
    endBiomassKg: p2.biomassKg,
    removedKg,
    addedKg,
    gainKg,
    gainSeKg,
    fcr,
    fcrSe,
    fcr95,
    note,
  };
}

/** FCR for each pair of consecutive weighings, and from the first weighing to the last. */
export function fcrPeriods(events: StockEventInput[], feedings: FeedingInput[]): { periods: FcrPeriod[]; overall: FcrPeriod | null } {
  const weighings = sortEvents(events).filter((e) => e.kind === 'sample_weighing' && weightOf(e, e.sampleSize ?? 0) !== null);
  const periods: FcrPeriod[] = [];
  for (let i = 1; i < weighings.length; i++) {
    const p = fcrBetween(events, feedings, weighings[i - 1]!.id, weighings[i]!.id);
    if (p) periods.push(p);
  }
  const overall = weighings.length >= 3 ? fcrBetween(events, feedings, weighings[0]!.id, weighings[weighings.length - 1]!.id) : (periods[0] ?? null);
  return { periods, overall };
}
