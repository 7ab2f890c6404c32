// The planned daily ration from a species feeding table: % body weight from the row matching the day's
// water temperature and the fish's mean weight, the feeding-day schedule, the hatchery-constant method
// for trout, linear temperature scaling where configured, and the per-hectare cap. Pure and isomorphic.
import { hatcheryConstant } from '../chemistry/loading';
import type { FeedRule, PlanStatus } from './rule';
import { speciesLabel } from './rule';

export type FeedTableRow = {
  minTemperatureC: number;
  maxTemperatureC: number;
  minWeightG: number;
  maxWeightG: number;
  /** % body weight per day; 0 = no feeding; −1 = hatchery-constant method; −0.5 = half of it. */
  pctBodyWeightPerDay: number;
  /** Feeding days per week: 7 daily, 3.5 every other day, 2 twice a week, 0 none. */
  daysPerWeek: number;
  note?: string | undefined;
  /** Hatchery-constant inputs for this row; the rule's defaults apply when absent. */
  fcr?: number | undefined;
  dailyLengthGainCm?: number | undefined;
};

export type FeedTableInput = { name: string; source: string; rows: FeedTableRow[]; maxKgPerHaPerDay: number | null };

const DAY_MS = 86_400_000;

/** Days since 1970-01-01 of a YYYY-MM-DD day (the farm-local calendar day). */
export function epochDayNumber(day: string): number {
  return Math.round(Date.parse(`${day}T00:00:00Z`) / DAY_MS);
}

/**
 * Whether `day` is a feeding day for a schedule of `daysPerWeek` days. The feeding days are spread
 * evenly over the calendar by day number n (days since 1970-01-01): feed on day n when
 * ⌊(n + 1)·d/7⌋ > ⌊n·d/7⌋. For d = 7 that is every day, for 3.5 every odd-numbered day (every other
 * day), for 2 two days in every seven about 3–4 days apart, for 0 never. It needs no memory of past
 * feedings, so every server and client agrees on the same days (product decision, docs/feeding.md).
 */
export function isFeedingDay({ day, daysPerWeek }: { day: string; daysPerWeek: number }): boolean {
  const d = Math.min(7, Math.max(0, daysPerWeek));
  if (d >= 7) return true;
  if (d <= 0) return false;
  const n = epochDayNumber(day);
  const eps = 1e-9;
  return Math.floor(((n + 1) * d) / 7 + eps) > Math.floor((n * d) / 7 + eps);
}

export function nextFeedingDay({ day, daysPerWeek }: { day: string; daysPerWeek: number }): string | null {
  if (daysPerWeek <= 0) return null;
  const n = epochDayNumber(day);
  for (let i = 1; i <= 14; i++) {
    const next = new Date((n + i) * DAY_MS).toISOString().slice(0, 10);
    if (isFeedingDay({ day: next, daysPerWeek })) return next;
  }
  return null;
}

const inBand = (v: number, min: number, max: number) => v >= min && v < max;

/** The row for a temperature and mean weight (bands include their lower bound, exclude their upper). */
export function matchFeedingRow({
  rows,
  temperatureC,
  meanWeightG,
}: {
  rows: FeedTableRow[];
  temperatureC: number;
  meanWeightG: number | null;
}): { row: FeedTableRow; index: number } | null {
  for (const [index, row] of rows.entries()) {
    if (!inBand(temperatureC, row.minTemperatureC, row.maxTemperatureC)) continue;
    const weightAgnostic = row.minWeightG <= 0 && row.maxWeightG >= 1e5;
    if (meanWeightG === null ? !weightAgnostic : !inBand(meanWeightG, row.minWeightG, row.maxWeightG)) continue;
    return { row, index };
  }
  return null;
}

export type RationInput = {
  day: string;
  species: string;
  table: FeedTableInput | null;
  temperatureC: number | null;
  /** How the temperature was found, e.g. "24-h probe mean"; used in the texts. */
  temperatureBasis: string;
  biomassKg: number | null;
  meanWeightG: number | null;
  meanLengthCm: number | null;
  areaM2: number | null;
};

export type RationPlan = {
  status: PlanStatus;
  /** One sentence a planner reads. */
  text: string;
  /** How the ration was worked out, step by step. */
  steps: string[];
  method: 'table' | 'hatchery_constant' | 'none';
  rowIndex: number | null;
  row: FeedTableRow | null;
  /** % BW the table gives on a feeding day, after the hatchery constant and temperature scaling. */
  tablePctBw: number | null;
  temperatureFactor: number | null;
  /** % BW planned for this day (0 on a rest day). */
  pctBodyWeightPerDay: number;
  uncappedKg: number;
  capKg: number | null;
  capApplied: boolean;
  plannedKg: number;
  daysPerWeek: number | null;
  feedingDay: boolean;
  nextFeedingDay: string | null;
};

const f1 = (v: number) => (Math.round(v * 10) / 10).toLocaleString('en-US');
const f2 = (v: number) => (Math.round(v * 100) / 100).toString();
const roundKg = (v: number) => Math.round(v * 10) / 10;

function empty(status: PlanStatus, text: string, steps: string[] = []): RationPlan {
  return {
    status,
    text,
    steps: steps.length ? steps : [text],
    method: 'none',
    rowIndex: null,
    row: null,
    tablePctBw: null,
    temperatureFactor: null,
    pctBodyWeightPerDay: 0,
    uncappedKg: 0,
    capKg: null,
    capApplied: false,
    plannedKg: 0,
    daysPerWeek: null,
    feedingDay: false,
    nextFeedingDay: null,
  };
}

/** The day's planned ration for one unit: biomass × % BW from the table, on the schedule's feeding days, capped. */
export function planRation(input: RationInput, rule: FeedRule): RationPlan {
  const species = speciesLabel(input.species);
  if (!input.table) return empty('no_plan', `No feeding table for ${species} on this farm; set one up or enter the ration by override`);
  if (input.biomassKg === null || input.biomassKg <= 0) return empty('no_plan', 'No biomass estimate: record a stocking and a sample weighing');
  if (input.temperatureC === null) return empty('no_plan', 'No water temperature from a probe or a kit result in the last days; take a reading before feeding');
  const t = input.temperatureC;
  const tText = `Water ${f1(t)} °C (${input.temperatureBasis})`;
  const match = matchFeedingRow({ rows: input.table.rows, temperatureC: t, meanWeightG: input.meanWeightG });
  if (!match) {
    const rows = input.table.rows;
    const lowest = Math.min(...rows.map((r) => r.minTemperatureC));
    const highest = Math.max(...rows.map((r) => r.maxTemperatureC));
    if (t < lowest) return empty('out_of_band', `${tText} is below ${f1(lowest)} °C, the lowest feeding band of “${input.table.name}”: no feeding`);
    if (t >= highest) return empty('out_of_band', `${tText} is above ${f1(highest)} °C, the highest feeding band of “${input.table.name}”: no feeding`);
    if (input.meanWeightG === null) return empty('no_plan', `“${input.table.name}” depends on fish size and no mean weight is known; record a sample weighing`);
    return empty('no_plan', `No row of “${input.table.name}” covers ${f1(t)} °C at ${f1(input.meanWeightG)} g`);
  }
  const { row, index } = match;
  const band = `${f1(row.minTemperatureC)}–${f1(row.maxTemperatureC)} °C`;
  if (row.pctBodyWeightPerDay === 0 || row.daysPerWeek <= 0) {
    const plan = empty('out_of_band', `${tText}, in the ${band} band: ${row.note ?? 'no feeding'} (“${input.table.name}”)`);
    return { ...plan, rowIndex: index, row, daysPerWeek: row.daysPerWeek };
  }
  const steps: string[] = [];
  let pct: number;
  let method: RationPlan['method'] = 'table';
  if (row.pctBodyWeightPerDay < 0) {
    // Hatchery-constant method (Haskell 1959; Piper et al. 1982): % BW = 3 × FCR × ΔL × 100 / L.
    method = 'hatchery_constant';
    if (input.meanLengthCm === null || input.meanLengthCm <= 0) {
      return { ...empty('no_plan', 'The hatchery-constant ration needs the mean length: record a sample weighing with length'), rowIndex: index, row };
    }
    const fcr = row.fcr ?? rule.hatcheryConstant.fcr;
    const dl = row.dailyLengthGainCm ?? rule.hatcheryConstant.dailyLengthGainCm;
    const hc = hatcheryConstant({ fcr, dailyLengthGain: dl });
    const share = -row.pctBodyWeightPerDay;
    pct = (share * hc) / input.meanLengthCm;
    steps.push(
      `Hatchery constant 3 × FCR ${fcr} × ΔL ${dl} cm/day × 100 = ${f2(hc)}; ÷ mean length ${f1(input.meanLengthCm)} cm = ${f2(hc / input.meanLengthCm)} % BW${share !== 1 ? `; × ${share} (${row.note ?? 'partial ration'}) = ${f2(pct)} % BW` : ''}`,
    );
  } else {
    pct = row.pctBodyWeightPerDay;
    steps.push(`${f2(pct)} % BW from the ${band} row${row.minWeightG > 0 || row.maxWeightG < 1e5 ? ` for ${f1(row.minWeightG)}–${f1(row.maxWeightG)} g fish` : ''} of “${input.table.name}”`);
  }
  let factor: number | null = null;
  const scaling = rule.temperatureScaling[input.species];
  if (scaling && scaling.fullAtC > scaling.zeroAtC) {
    factor = Math.min(1, Math.max(0, (t - scaling.zeroAtC) / (scaling.fullAtC - scaling.zeroAtC)));
    if (factor < 1) {
      pct *= factor;
      steps.push(`× ${f2(factor)} for ${f1(t)} °C on the linear scale from ${f1(scaling.zeroAtC)} °C (none) to ${f1(scaling.fullAtC)} °C (full ration) = ${f2(pct)} % BW (${scaling.source})`);
    }
  }
  if (pct <= 0) return { ...empty('out_of_band', `${tText}: no ration at this temperature`), rowIndex: index, row, method };
  const uncapped = (input.biomassKg * pct) / 100;
  steps.push(`${f2(pct)} % × ${f1(input.biomassKg)} kg biomass = ${f1(uncapped)} kg`);
  let capKg: number | null = null;
  let capped = uncapped;
  if (input.table.maxKgPerHaPerDay !== null && input.areaM2 !== null && input.areaM2 > 0) {
    capKg = (input.table.maxKgPerHaPerDay * input.areaM2) / 10_000;
    if (uncapped > capKg) {
      capped = capKg;
      steps.push(`capped at ${f1(input.table.maxKgPerHaPerDay)} kg/ha/day × ${f2(input.areaM2 / 10_000)} ha = ${f1(capKg)} kg`);
    }
  }
  const feedingDay = isFeedingDay({ day: input.day, daysPerWeek: row.daysPerWeek });
  const next = row.daysPerWeek < 7 ? nextFeedingDay({ day: input.day, daysPerWeek: row.daysPerWeek }) : null;
  const schedule = row.daysPerWeek >= 7 ? 'daily' : row.daysPerWeek === 3.5 ? 'every other day' : `${f1(row.daysPerWeek)} days a week`;
  const base: RationPlan = {
    status: 'ok',
    text: '',
    steps,
    method,
    rowIndex: index,
    row,
    tablePctBw: pct,
    temperatureFactor: factor,
    pctBodyWeightPerDay: pct,
    uncappedKg: uncapped,
    capKg,
    capApplied: capped < uncapped,
    plannedKg: roundKg(capped),
    daysPerWeek: row.daysPerWeek,
    feedingDay,
    nextFeedingDay: next,
  };
  if (!feedingDay) {
    steps.push(`${input.day} is not a feeding day on the ${schedule} schedule; next feeding day ${next ?? 'none'}`);
    return {
      ...base,
      status: 'not_feeding_day',
      text: `${tText}: ${f2(pct)} % BW ${schedule} in the ${band} band, and today is a rest day (next feeding day ${next ?? 'none'})`,
      pctBodyWeightPerDay: 0,
      plannedKg: 0,
    };
  }
  return { ...base, text: `${tText}: ${f2(pct)} % BW ${schedule} → ${f1(base.plannedKg)} kg${base.capApplied ? ' (per-hectare cap)' : ''}` };
}
