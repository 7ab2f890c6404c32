// The unit evaluation as a pure function: a unit's latest facts and its threshold profile in, one
// check per condition out (raise / hold / clear). No I/O; same facts and `now`, same answer.
// Rules, defaults and their sources: docs/alerts.md.
import { EPA2013_RANGE, epa2013Criteria, projectDawnOxygen } from '../../../shared/chemistry';
import { addDays, hhmm, localParts, zonedTime } from '../../../shared/farm-time';
import type { AlertKind, AlertLevel, AlertRule, DawnProjectionDto } from '../../../shared/schemas/alerts.schema';
import type { UnitStatusLevel } from '../../../shared/schemas/farms.schema';
import { statusNeutralKinds } from '../../../shared/schemas/alerts.schema';
import { clearsAt, limitsAt, metricDirection, type ThresholdMetric } from '../../../shared/schemas/thresholds.schema';
import { NO2_PER_NO2_N } from '../../../shared/units';
import type { FarmSettings, ThresholdRule } from '../../db/entities';

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;

/** Product decisions of the evaluation (docs/alerts.md). */
export const EVALUATION_RULES = {
  /** A handheld (spot) pH, temperature, DO or salinity test counts as current for this long. */
  spotFreshHours: 6,
  /** Below this a flow probe reads "no flow". */
  flowLostLpm: 1,
  /** DO counts as falling when it dropped at least this much over the last hour. */
  doFallMgL: 0.2,
  /** An aerator or pump that reported running within this window and is now off has "stopped". */
  recentRunHours: 2,
  /** The dawn projection needs readings spanning at least this long since dusk. */
  projectionMinSpanMinutes: 60,
  /** Probe readings since dusk are averaged into buckets of this size for the projection fit. */
  projectionBucketMinutes: 15,
  /** probe_silent turns act-level after this many times the silence threshold. */
  silentActFactor: 2,
} as const;

// --- inputs ---

export type ProbeFindingLike =
  | { kind: 'silent'; lastReadingAt: string | null; silentForSeconds: number; thresholdSeconds: number }
  | { kind: 'maintenance'; windowId: string; reason: string; endsAt: string }
  | { kind: 'flatline'; quantity: string; value: number; readings: number; sinceAt: string; minutes: number }
  | { kind: 'spike'; quantity: string; suspectCount: number; lastAt: string }
  | { kind: 'drift'; quantity: string; meanDifference: number; threshold: number; pairs: number }
  | { kind: 'calibration_due'; quantity: string; nextDueAt: string | null; lastCalibratedAt: string | null };

/** What ProbeHealthService.evaluate answers per probe (the fields used here). */
export type ProbeHealthLike = {
  probeId: string;
  unitId: string | null;
  state: 'ok' | 'attention' | 'silent' | 'maintenance' | 'inactive';
  lastReadingAt: string | null;
  findings: ProbeFindingLike[];
};

export type Latest = { value: number; at: Date; probeId: string };
export type Spot = { value: number; at: Date; testId: string };

export type UnitFacts = {
  unit: {
    id: string;
    code: string;
    name: string;
    kind: 'pond' | 'raceway' | 'tank';
    state: 'active' | 'cycling' | 'fallow';
    waterType: 'fresh' | 'brackish' | 'marine';
    species: string | null;
    defaultSalinityPpt: number;
    testFrequencyDays: number | null;
    closeWatchUntil: Date | null;
    createdAt: Date;
  };
  profile: { id: string; name: string; species: string; rules: ThresholdRule[] } | null;
  /** Newest result with status ok (free ammonia computed). */
  latestOkResult: {
    id: string;
    waterTestId: string;
    sampledAt: Date;
    tanMgL: number | null;
    nh3MgL: number | null;
    nh3NMgL: number | null;
    ph: number | null;
    temperatureC: number | null;
    salinityPpt: number | null;
  } | null;
  /** Newest result of any status (its kit flags count even without a free-ammonia number). */
  latestResultFlags: { id: string; waterTestId: string; sampledAt: Date; flags: Array<{ code: string; message: string }> } | null;
  /** The routine ammonia test schedule entry of the unit (tasks module; null for fallow units). */
  testDue: { everyDays: number; dueDay: string; status: 'overdue' | 'due' | 'upcoming'; daysOverdue: number; reason: string; lastTestAt: Date | null } | null;
  latestNitrite: { id: string; sampledAt: Date; value: number; basis: string } | null;
  /** Newest spot tests per quantity (ph, water_temperature, dissolved_oxygen, salinity). */
  spot: Partial<Record<SpotQuantity, Spot>>;
  probes: Array<{ id: string; label: string; active: boolean; intervalSeconds: number; quantities: string[] }>;
  health: ProbeHealthLike[];
  /** Newest good reading per quantity across the unit's probes. */
  latest: Partial<Record<string, Latest>>;
  /** DO about an hour before now (for "falling"). */
  doHourAgo: Latest | null;
  ranRecently: { aerator: boolean; pump: boolean };
  /** Since dusk: 15-minute means of probe DO, or the night-round spot tests. */
  nightDo: { basedOn: 'probe' | 'spot_test'; points: Array<{ at: Date; doMgL: number }> } | null;
};

export type SpotQuantity = 'ph' | 'water_temperature' | 'dissolved_oxygen' | 'salinity';

export type NightWindow = { duskAt: Date; dawnAt: Date; isNight: boolean };

export type FarmContext = {
  farmId: string;
  timeZone: string;
  settings: FarmSettings;
  now: Date;
  night: NightWindow;
  /** A farm_silent condition is open: probe-by-probe silence is held instead of raised. */
  farmSilent: boolean;
};

// --- outputs ---

export type Verdict = 'raise' | 'hold' | 'clear';

export type Check = {
  kind: AlertKind;
  conditionKey: string;
  verdict: Verdict;
  level: AlertLevel | null;
  unitId: string | null;
  probeId: string | null;
  value: number | null;
  valueUnit: string | null;
  at: Date | null;
  source: string | null;
  rule: AlertRule | null;
  title: string | null;
  message: string | null;
  note: string | null;
  values: Record<string, unknown>;
};

export type EpaReference = {
  applicable: boolean;
  note: string;
  pH: number | null;
  temperatureC: number | null;
  oncorhynchusPresent: boolean;
  cmcMgL: number | null;
  cccMgL: number | null;
  fourDayMaxMgL: number | null;
  latestTanMgL: number | null;
  source: string;
};

export type UnitEvaluationResult = {
  checks: Check[];
  /** Keys with no check that must stay open anyway (a silent probe's data-quality conditions). */
  holdPrefixes: string[];
  /** Why open alerts of the unit without a check are resolved (rule removed, unit fallow). */
  scopeNote: string;
  dawnProjection: DawnProjectionDto | null;
  epa: EpaReference;
};

// --- labels ---

export const kindTitles: Record<AlertKind, string> = {
  nh3_high: 'Free ammonia high',
  tan_high: 'TAN high',
  nitrite_high: 'Nitrite high',
  ph_low: 'pH low',
  ph_high: 'pH high',
  temperature_low: 'Water too cold',
  temperature_high: 'Water too warm',
  salinity_high: 'Salinity high',
  do_low: 'Dissolved oxygen low',
  do_projected_low: 'Dawn oxygen projected low',
  flow_low: 'Flow low',
  flow_lost: 'Flow lost',
  aerator_stopped: 'Aerator off while oxygen falls',
  pump_stopped: 'Pump off',
  probe_silent: 'Probe silent',
  farm_silent: 'No probe data from the farm',
  flatline: 'Probe reading stuck',
  spike: 'Implausible probe readings',
  drift: 'Probe drifting from handheld checks',
  calibration_due: 'Calibration due',
  kit_interference: 'Kit result may read high',
  test_overdue: 'Ammonia test overdue',
};

const METRICS: Record<ThresholdMetric, { kind: AlertKind; label: string; decimals: number }> = {
  nh3: { kind: 'nh3_high', label: 'Free ammonia', decimals: 3 },
  tan: { kind: 'tan_high', label: 'TAN', decimals: 2 },
  nitrite: { kind: 'nitrite_high', label: 'Nitrite', decimals: 2 },
  ph_min: { kind: 'ph_low', label: 'pH', decimals: 2 },
  ph_max: { kind: 'ph_high', label: 'pH', decimals: 2 },
  temperature_min: { kind: 'temperature_low', label: 'Water temperature', decimals: 1 },
  temperature_max: { kind: 'temperature_high', label: 'Water temperature', decimals: 1 },
  do_min: { kind: 'do_low', label: 'Dissolved oxygen', decimals: 1 },
  flow_min: { kind: 'flow_low', label: 'Flow', decimals: 0 },
  salinity_max: { kind: 'salinity_high', label: 'Salinity', decimals: 1 },
};

const ADVICE: Partial<Record<AlertKind, { watch: string; act: string }>> = {
  nh3_high: { watch: 'Re-test in the afternoon and watch feeding.', act: 'Re-test, and consider cutting or withholding feed (see the ration recommendation).' },
  tan_high: { watch: 'Watch feeding and re-test.', act: 'Check feeding and the biofilter, and re-test with pH and temperature.' },
  nitrite_high: { watch: 'Check chloride (keep chloride at least 10 × nitrite).', act: 'Check chloride now (keep chloride at least 10 × nitrite, SRAC 462) and re-test.' },
  do_low: { watch: 'Have aerators ready and check again soon.', act: 'Start aeration or add water now.' },
  ph_low: { watch: 'Re-check with a handheld meter.', act: 'Re-check with a handheld meter and check alkalinity.' },
  ph_high: { watch: 'Re-check in the afternoon peak; free ammonia rises with pH.', act: 'Re-check with a handheld meter; free ammonia rises steeply with pH.' },
  temperature_low: { watch: 'Expect lower feeding response.', act: 'Reduce or stop feeding as the feeding table says.' },
  temperature_high: { watch: 'Expect lower oxygen; watch DO and feeding.', act: 'Reduce feeding and watch DO closely.' },
  flow_low: { watch: 'Check valves, screens and the inflow.', act: 'Check valves and screens now: the raceway is losing flow.' },
  salinity_high: { watch: 'Check the water source.', act: 'Check the water source and exchange.' },
};

const QUANTITY_LABELS: Record<string, string> = {
  ph: 'pH',
  water_temperature: 'temperature',
  dissolved_oxygen: 'DO',
  salinity: 'salinity',
  conductivity: 'conductivity',
  specific_conductance: 'specific conductance',
  flow: 'flow',
  water_level: 'water level',
  aerator_running: 'aerator state',
  pump_running: 'pump state',
};

const round = (v: number, d: number) => Math.round(v * 10 ** d) / 10 ** d;
const fmt = (v: number, decimals: number) => v.toFixed(decimals);

export function localHhmm(at: Date, timeZone: string): string {
  const p = localParts(at, timeZone);
  return hhmm(p.hour, p.minute);
}

function duration(seconds: number): string {
  const m = Math.round(seconds / 60);
  if (m < 90) return `${m} min`;
  const h = Math.floor(m / 60);
  return `${h} h ${m % 60} min`;
}

const oncorhynchus = (species: string | null) => /trout|salmon|steelhead|oncorhynchus/i.test(species ?? '');

// --- time ---

const parseHhmm = (s: string): [number, number] => {
  const [h, m] = s.split(':').map(Number) as [number, number];
  return [h, m];
};

/**
 * The night around `now` (farm-local dusk to dawn): the last dusk at or before now and the first dawn
 * after it. `isNight` when now is before that dawn.
 */
export function nightAround(now: Date, timeZone: string, duskLocal: string, dawnLocal: string): NightWindow {
  const [dh, dm] = parseHhmm(duskLocal);
  const [wh, wm] = parseHhmm(dawnLocal);
  const today = localParts(now, timeZone).day;
  let duskAt = zonedTime(today, dh, dm, timeZone);
  if (duskAt.getTime() > now.getTime()) duskAt = zonedTime(addDays(today, -1), dh, dm, timeZone);
  const duskDay = localParts(duskAt, timeZone).day;
  let dawnAt = zonedTime(duskDay, wh, wm, timeZone);
  if (dawnAt.getTime() <= duskAt.getTime()) dawnAt = zonedTime(addDays(duskDay, 1), wh, wm, timeZone);
  return { duskAt, dawnAt, isNight: now.getTime() < dawnAt.getTime() };
}

/** The night that ends on a farm-local day's dawn (the morning report's night). */
export function nightEndingOn(day: string, timeZone: string, duskLocal: string, dawnLocal: string): { duskAt: Date; dawnAt: Date } {
  const [dh, dm] = parseHhmm(duskLocal);
  const [wh, wm] = parseHhmm(dawnLocal);
  const dawnAt = zonedTime(day, wh, wm, timeZone);
  let duskAt = zonedTime(day, dh, dm, timeZone);
  if (duskAt.getTime() >= dawnAt.getTime()) duskAt = zonedTime(addDays(day, -1), dh, dm, timeZone);
  return { duskAt, dawnAt };
}

// --- the evaluation ---

type Current = { value: number; at: Date; source: 'probe' | 'spot test'; probeId: string | null; testId: string | null };

export function evaluateUnitFacts(f: UnitFacts, ctx: FarmContext): UnitEvaluationResult {
  const epa = epaReference(f, ctx);
  if (f.unit.state === 'fallow') {
    return { checks: [], holdPrefixes: [], scopeNote: 'The unit is fallow: fallow units raise nothing.', dawnProjection: null, epa };
  }
  const checks: Check[] = [];
  const holdPrefixes: string[] = [];
  const tz = ctx.timeZone;
  const unit = f.unit;
  const settings = ctx.settings;
  const rules = new Map((f.profile?.rules ?? []).map((r) => [r.metric, r]));
  const probeById = new Map(f.probes.map((p) => [p.id, p]));

  const base = (kind: AlertKind, key: string, probeId: string | null = null): Check => ({
    kind,
    conditionKey: key,
    verdict: 'clear',
    level: null,
    unitId: unit.id,
    probeId,
    value: null,
    valueUnit: null,
    at: null,
    source: null,
    rule: null,
    title: null,
    message: null,
    note: null,
    values: {},
  });
  const unitKey = (kind: AlertKind) => `${kind}:${unit.id}`;
  const title = (kind: AlertKind) => `${kindTitles[kind]} in ${unit.name}`;

  const fresh = (q: string, spotQ: SpotQuantity | null): Current | null => {
    const candidates: Current[] = [];
    const l = f.latest[q];
    if (l) {
      const p = probeById.get(l.probeId);
      const limitMs = settings.silentAfterMissedIntervals * (p?.intervalSeconds ?? 60) * 1000;
      if (ctx.now.getTime() - l.at.getTime() <= limitMs) candidates.push({ value: l.value, at: l.at, source: 'probe', probeId: l.probeId, testId: null });
    }
    const s = spotQ ? f.spot[spotQ] : undefined;
    if (s && ctx.now.getTime() - s.at.getTime() <= EVALUATION_RULES.spotFreshHours * HOUR) {
      candidates.push({ value: s.value, at: s.at, source: 'spot test', probeId: null, testId: s.testId });
    }
    return candidates.sort((a, b) => b.at.getTime() - a.at.getTime())[0] ?? null;
  };

  const ruleOf = (r: ThresholdRule, threshold: number | null, watch: number | null, act: number | null, salinityPpt: number | null): AlertRule => ({
    metric: r.metric,
    threshold,
    watch,
    act,
    basis: r.basis,
    source: r.source,
    clearsAt: (watch ?? act) !== null ? clearsAt(r.metric, (watch ?? act) as number) : null,
    salinityPpt,
    profileId: f.profile?.id ?? null,
    profileName: f.profile?.name ?? null,
  });

  /** Compares a value with a rule's limits (hysteresis on the way back). */
  const judge = (metric: ThresholdMetric, r: ThresholdRule, value: number, measured: { at: Date; source: string; probeId: string | null; what: string }, extra: Record<string, unknown>, salinityPpt: number | null, watch = r.watch, act = r.act) => {
    const info = METRICS[metric];
    const c = base(info.kind, unitKey(info.kind), measured.probeId);
    const upper = metricDirection[metric] === 'upper';
    const beyond = (limit: number) => (upper ? value > limit : value < limit);
    c.value = round(value, 6);
    c.valueUnit = r.basis;
    c.at = measured.at;
    c.source = measured.source;
    c.values = { value: c.value, basis: r.basis, at: measured.at.toISOString(), source: measured.source, ...extra };
    const level: AlertLevel | null = act !== null && beyond(act) ? 'act' : watch !== null && beyond(watch) ? 'watch' : null;
    const threshold = level === 'act' ? act : level === 'watch' ? watch : null;
    c.rule = ruleOf(r, threshold, watch, act, salinityPpt);
    if (level) {
      c.verdict = 'raise';
      c.level = level;
      const word = upper ? 'above' : 'below';
      const basisText = r.basis === 'pH' ? '' : ` ${r.basis}`;
      const advice = ADVICE[info.kind]?.[level] ?? '';
      const salText = salinityPpt !== null ? ` (limit at ${fmt(salinityPpt, 1)} ‰)` : '';
      c.title = title(info.kind);
      c.message =
        `${info.label} ${fmt(value, info.decimals)}${basisText} (${measured.what} at ${localHhmm(measured.at, tz)}) is ${word} the ${level} limit of ` +
        `${fmt(threshold as number, info.decimals)}${basisText}${salText}. ${advice}`.trim();
      return c;
    }
    const inner = (watch ?? act) as number;
    const clear = clearsAt(metric, inner);
    const cleared = upper ? value <= clear : value >= clear;
    c.verdict = cleared ? 'clear' : 'hold';
    c.note = cleared
      ? `Inside the watch limit by the clear margin (clears at ${clear}).`
      : `Inside the limit of ${inner} but not yet past ${clear}: an open alert stays until it is (hysteresis).`;
    return c;
  };

  const noData = (kind: AlertKind, note: string, probeId: string | null = null) => {
    const c = base(kind, unitKey(kind), probeId);
    c.verdict = 'hold';
    c.note = note;
    return c;
  };

  // Free ammonia and TAN from the latest computed kit result.
  const res = f.latestOkResult;
  const nh3Rule = rules.get('nh3');
  if (nh3Rule) {
    if (!res) checks.push(noData('nh3_high', 'No computed free-ammonia result yet.'));
    else {
      const nh3 = nh3Rule.basis === 'mg/L NH3-N' ? res.nh3NMgL : res.nh3MgL;
      const salinity = nh3Rule.bySalinity ? (res.salinityPpt ?? unit.defaultSalinityPpt) : null;
      const lim = limitsAt(nh3Rule, salinity);
      if (nh3 === null) checks.push(noData('nh3_high', 'The latest result has no free-ammonia value.'));
      else {
        checks.push(
          judge('nh3', nh3Rule, nh3, { at: res.sampledAt, source: 'kit result', probeId: null, what: 'kit test' }, { resultId: res.id, waterTestId: res.waterTestId, tanMgL: res.tanMgL, pH: res.ph, temperatureC: res.temperatureC, salinityPpt: res.salinityPpt }, lim.salinityPpt, lim.watch, lim.act),
        );
      }
    }
  }
  const tanRule = rules.get('tan');
  if (tanRule) {
    if (!res || res.tanMgL === null) checks.push(noData('tan_high', 'No TAN result yet.'));
    else checks.push(judge('tan', tanRule, res.tanMgL, { at: res.sampledAt, source: 'kit result', probeId: null, what: 'kit test' }, { resultId: res.id, waterTestId: res.waterTestId }, null));
  }

  // Nitrite from the latest nitrite test, converted to the rule's basis (NO2 = NO2-N × 3.28454, computed from molar masses).
  const no2Rule = rules.get('nitrite');
  if (no2Rule) {
    const t = f.latestNitrite;
    if (!t) checks.push(noData('nitrite_high', 'No nitrite test yet.'));
    else {
      const asN = t.basis === 'no2' ? t.value / NO2_PER_NO2_N : t.value;
      const value = no2Rule.basis === 'mg/L NO2' ? asN * NO2_PER_NO2_N : asN;
      const salinity = no2Rule.bySalinity ? unit.defaultSalinityPpt : null;
      const lim = limitsAt(no2Rule, salinity);
      checks.push(judge('nitrite', no2Rule, value, { at: t.sampledAt, source: 'kit test', probeId: null, what: 'kit test' }, { waterTestId: t.id, measured: t.value, measuredBasis: t.basis }, lim.salinityPpt, lim.watch, lim.act));
    }
  }

  // Probe (or spot-test) values.
  const probeMetrics: Array<[ThresholdMetric, string, SpotQuantity | null]> = [
    ['ph_min', 'ph', 'ph'],
    ['ph_max', 'ph', 'ph'],
    ['temperature_min', 'water_temperature', 'water_temperature'],
    ['temperature_max', 'water_temperature', 'water_temperature'],
    ['do_min', 'dissolved_oxygen', 'dissolved_oxygen'],
    ['salinity_max', 'salinity', 'salinity'],
    ['flow_min', 'flow', null],
  ];
  const flow = fresh('flow', null);
  const flowLost = flow !== null && flow.value < EVALUATION_RULES.flowLostLpm;
  for (const [metric, quantity, spotQ] of probeMetrics) {
    const r = rules.get(metric);
    if (!r) continue;
    const cur = fresh(quantity, spotQ);
    if (!cur) {
      checks.push(noData(METRICS[metric].kind, 'No fresh value (probe silent or no recent spot test).'));
      continue;
    }
    const c = judge(metric, r, cur.value, { at: cur.at, source: cur.source, probeId: cur.probeId, what: cur.source === 'probe' ? `${probeById.get(cur.probeId ?? '')?.label ?? 'probe'}` : 'spot test' }, cur.testId ? { testId: cur.testId } : { probeId: cur.probeId }, null);
    if (metric === 'flow_min' && flowLost && c.verdict === 'raise') {
      c.verdict = 'hold';
      c.level = null;
      c.title = null;
      c.message = null;
      c.note = 'Flow is lost: reported as flow_lost instead.';
    }
    checks.push(c);
  }

  // Flow lost: any unit whose probe reports flow.
  const reportsFlow = f.probes.some((p) => p.active && p.quantities.includes('flow'));
  if (reportsFlow) {
    const c = base('flow_lost', unitKey('flow_lost'), flow?.probeId ?? null);
    const flowRule = rules.get('flow_min');
    c.rule = {
      metric: null,
      threshold: EVALUATION_RULES.flowLostLpm,
      watch: null,
      act: EVALUATION_RULES.flowLostLpm,
      basis: 'L/min',
      source: `product decision: below ${EVALUATION_RULES.flowLostLpm} L/min counts as no flow`,
      clearsAt: EVALUATION_RULES.flowLostLpm,
      salinityPpt: null,
      profileId: f.profile?.id ?? null,
      profileName: f.profile?.name ?? null,
    };
    if (!flow) {
      c.verdict = 'hold';
      c.note = 'No fresh flow reading.';
    } else {
      c.value = flow.value;
      c.valueUnit = 'L/min';
      c.at = flow.at;
      c.source = 'probe';
      c.values = { value: flow.value, basis: 'L/min', at: flow.at.toISOString(), probeId: flow.probeId, ...(flowRule ? { flowMinWatchLpm: flowRule.watch, flowMinActLpm: flowRule.act } : {}) };
      if (flowLost) {
        c.verdict = 'raise';
        c.level = 'act';
        c.title = title('flow_lost');
        c.message = `The flow probe reads ${fmt(flow.value, 1)} L/min at ${localHhmm(flow.at, tz)}: no water is coming in. Check valves, screens, pumps and power now.`;
      } else c.note = 'Water is flowing.';
    }
    checks.push(c);
  }

  // Aerator and pump off while oxygen falls (or flow is lost).
  const doNow = fresh('dissolved_oxygen', null);
  const doFalling = Boolean(doNow && f.doHourAgo && doNow.probeId === f.doHourAgo.probeId && f.doHourAgo.value - doNow.value >= EVALUATION_RULES.doFallMgL);
  const doWatch = rules.get('do_min')?.watch ?? rules.get('do_min')?.act ?? null;
  const equipment: Array<['aerator_stopped' | 'pump_stopped', string, boolean]> = [
    ['aerator_stopped', 'aerator_running', f.ranRecently.aerator],
    ['pump_stopped', 'pump_running', f.ranRecently.pump],
  ];
  for (const [kind, quantity, ranRecently] of equipment) {
    if (!f.probes.some((p) => p.active && p.quantities.includes(quantity))) continue;
    const state = fresh(quantity, null);
    const c = base(kind, unitKey(kind), state?.probeId ?? null);
    c.rule = {
      metric: null,
      threshold: null,
      watch: null,
      act: doWatch,
      basis: 'running (1) / off (0)',
      source: `product decision: off while DO fell ≥ ${EVALUATION_RULES.doFallMgL} mg/L in the last hour${kind === 'pump_stopped' ? ' or while flow is lost' : ''}; act when DO is at or below the watch limit`,
      clearsAt: null,
      salinityPpt: null,
      profileId: f.profile?.id ?? null,
      profileName: f.profile?.name ?? null,
    };
    if (!state) {
      c.verdict = 'hold';
      c.note = `No fresh ${QUANTITY_LABELS[quantity]} reading.`;
      checks.push(c);
      continue;
    }
    c.value = state.value;
    c.valueUnit = 'running';
    c.at = state.at;
    c.source = 'probe';
    c.values = {
      running: state.value >= 0.5,
      at: state.at.toISOString(),
      doMgL: doNow?.value ?? null,
      doHourAgoMgL: f.doHourAgo?.value ?? null,
      doFalling,
      flowLpm: flow?.value ?? null,
      ranWithinHours: ranRecently ? EVALUATION_RULES.recentRunHours : null,
    };
    const off = state.value < 0.5;
    const lowDo = doNow !== null && doWatch !== null && doNow.value <= doWatch;
    const what = kind === 'aerator_stopped' ? 'aerator' : 'pump';
    let level: AlertLevel | null = null;
    if (off && kind === 'pump_stopped' && flowLost) level = 'act';
    else if (off && doFalling && lowDo) level = 'act';
    else if (off && doFalling && (ranRecently || kind === 'pump_stopped')) level = 'watch';
    if (level) {
      c.verdict = 'raise';
      c.level = level;
      c.title = `${kind === 'aerator_stopped' ? kindTitles.aerator_stopped : kindTitles.pump_stopped} in ${unit.name}`;
      const doText = doNow ? `DO ${fmt(doNow.value, 1)} mg/L${f.doHourAgo ? `, down from ${fmt(f.doHourAgo.value, 1)} an hour ago` : ''}` : 'DO unknown';
      c.message =
        kind === 'pump_stopped' && flowLost
          ? `The pump reports off at ${localHhmm(state.at, tz)} and no water is flowing. Restart the pump or open the supply now.`
          : `The ${what} reports off at ${localHhmm(state.at, tz)} while oxygen falls (${doText}). ${level === 'act' ? `Start the ${what} now.` : `Check why the ${what} stopped.`}`;
    } else c.note = off ? `The ${what} is off, but oxygen is not falling.` : `The ${what} is running.`;
    checks.push(c);
  }

  // Dawn oxygen projection (ponds, at night).
  let dawnProjection: DawnProjectionDto | null = null;
  const doRule = rules.get('do_min');
  if (unit.kind === 'pond' && doRule && (doRule.watch !== null || doRule.act !== null)) {
    const c = base('do_projected_low', unitKey('do_projected_low'));
    const watch = (doRule.watch ?? doRule.act) as number;
    const act = doRule.act;
    c.rule = {
      metric: 'do_min',
      threshold: null,
      watch,
      act,
      basis: 'mg/L DO',
      source: `${doRule.source}; projection: linear (Boyd, Romaire & Johnston 1978, UF/IFAS FA27, published) and log-linear (Madenjian, Rogers & Fast 1987, form from memory), alarm on the lower`,
      clearsAt: clearsAt('do_min', watch),
      salinityPpt: null,
      profileId: f.profile?.id ?? null,
      profileName: f.profile?.name ?? null,
    };
    const night = ctx.night;
    const points = (f.nightDo?.points ?? []).filter((p) => p.doMgL > 0.05 && p.at.getTime() >= night.duskAt.getTime());
    const span = points.length ? (points[points.length - 1]!.at.getTime() - points[0]!.at.getTime()) / MINUTE : 0;
    if (!night.isNight) {
      c.verdict = 'clear';
      c.note = 'Projected only between dusk and dawn; by day the measured DO is watched.';
    } else if (points.length < 2 || span < EVALUATION_RULES.projectionMinSpanMinutes) {
      c.verdict = 'hold';
      c.note = `Needs DO readings since dusk spanning at least ${EVALUATION_RULES.projectionMinSpanMinutes} min.`;
    } else {
      try {
        const readings = points.map((p) => ({ at: p.at.toISOString(), doMgL: p.doMgL }));
        const dawnAt = night.dawnAt.toISOString();
        const proj = projectDawnOxygen({ readings, dawnAt, thresholdMgL: watch, duskAt: night.duskAt.toISOString() });
        const actProj = act !== null && act !== watch ? projectDawnOxygen({ readings, dawnAt, thresholdMgL: act, duskAt: night.duskAt.toISOString() }) : null;
        const lower = proj[proj.lower];
        const crossesAt = lower.crossesAt ? new Date(lower.crossesAt) : null;
        dawnProjection = {
          duskAt: night.duskAt.toISOString(),
          dawnAt,
          thresholdMgL: watch,
          actThresholdMgL: act,
          linear: { doAtDawnMgL: round(proj.linear.doAtDawnMgL, 3), crossesAt: proj.linear.crossesAt },
          logLinear: { doAtDawnMgL: round(proj.logLinear.doAtDawnMgL, 3), crossesAt: proj.logLinear.crossesAt },
          lower: proj.lower,
          doAtDawnMgL: round(proj.doAtDawnMgL, 3),
          crossesAt: crossesAt?.toISOString() ?? null,
          crossesLocalTime: crossesAt ? localHhmm(crossesAt, tz) : null,
          basedOn: f.nightDo?.basedOn ?? 'probe',
          readingsUsed: proj.readingsUsed.map((r) => ({ at: r.at, doMgL: round(r.doMgL, 3) })),
        };
        c.value = dawnProjection.doAtDawnMgL;
        c.valueUnit = 'mg/L DO';
        c.at = night.dawnAt;
        c.source = 'projection';
        c.values = { ...dawnProjection };
        const level: AlertLevel | null = act !== null && proj.doAtDawnMgL < act ? 'act' : proj.doAtDawnMgL < watch ? 'watch' : null;
        if (level) {
          c.verdict = 'raise';
          c.level = level;
          c.rule.threshold = level === 'act' ? act : watch;
          c.title = title('do_projected_low');
          const methodText = `linear ${fmt(proj.linear.doAtDawnMgL, 1)}, log-linear ${fmt(proj.logLinear.doAtDawnMgL, 1)}`;
          const basedText = dawnProjection.basedOn === 'probe' ? `${points.length} probe means since ${localHhmm(night.duskAt, tz)}` : `${points.length} night-round DO tests since ${localHhmm(night.duskAt, tz)}`;
          const actCross = actProj?.[actProj.lower].crossesAt;
          const actText = level === 'act' && act !== null && actCross ? ` Below ${fmt(act, 1)} mg/L by ${localHhmm(new Date(actCross), tz)}.` : '';
          c.message =
            `DO projected below ${fmt(watch, 1)} mg/L by ${crossesAt ? localHhmm(crossesAt, tz) : localHhmm(night.dawnAt, tz)}: ` +
            `${fmt(proj.doAtDawnMgL, 1)} mg/L at dawn (${localHhmm(night.dawnAt, tz)}; ${methodText}; ${basedText}).${actText} ` +
            (level === 'act' ? 'Start aerators before then.' : 'Have aerators ready and check again.');
        } else {
          const clear = clearsAt('do_min', watch);
          c.verdict = proj.doAtDawnMgL >= clear ? 'clear' : 'hold';
          c.note = c.verdict === 'clear' ? `Projected ${fmt(proj.doAtDawnMgL, 1)} mg/L at dawn.` : `Projected just above ${watch} mg/L but not yet past ${clear} (hysteresis).`;
        }
      } catch (err) {
        c.verdict = 'hold';
        c.note = `Projection not possible: ${err instanceof Error ? err.message : String(err)}`;
      }
    }
    checks.push(c);
  }

  // Kit interference flags of the latest result.
  {
    const c = base('kit_interference', unitKey('kit_interference'));
    const r = f.latestResultFlags;
    const flag = r?.flags.find((x) => x.code !== 'out_of_range');
    c.rule = { metric: null, threshold: null, watch: null, act: null, basis: null, source: 'Nessler results read falsely high after formalin, copper or ammonia binders; salicylate kits do not (product.md)', clearsAt: null, salinityPpt: null, profileId: null, profileName: null };
    if (r && flag) {
      c.verdict = 'raise';
      c.level = 'watch';
      c.at = r.sampledAt;
      c.source = 'kit result';
      c.values = { resultId: r.id, waterTestId: r.waterTestId, flag: flag.code, sampledAt: r.sampledAt.toISOString() };
      c.title = title('kit_interference');
      c.message = flag.message;
    } else c.note = 'The latest kit result carries no interference flag.';
    checks.push(c);
  }

  // Routine ammonia test overdue (farm-local days, the tasks module's schedule).
  const due = f.testDue;
  if (due) {
    const c = base('test_overdue', unitKey('test_overdue'));
    c.rule = { metric: null, threshold: due.everyDays, watch: due.everyDays, act: null, basis: 'days between routine tests', source: 'common practice (product.md): daily until the biofilter is established, then weekly or the unit\'s own frequency; daily under closer watch', clearsAt: null, salinityPpt: null, profileId: null, profileName: null };
    c.values = { lastTestAt: due.lastTestAt?.toISOString() ?? null, dueDay: due.dueDay, everyDays: due.everyDays, daysOverdue: due.daysOverdue, reason: due.reason, timeZone: tz };
    c.value = due.daysOverdue;
    c.valueUnit = 'days overdue';
    c.source = 'schedule';
    if (due.status === 'overdue') {
      c.verdict = 'raise';
      c.level = 'watch';
      c.title = title('test_overdue');
      const last = due.lastTestAt ? `Last ammonia test on ${localParts(due.lastTestAt, tz).day}` : 'No ammonia test recorded';
      c.message = `${last}; the next was due on ${due.dueDay} (${due.reason}). ${due.daysOverdue} day(s) overdue.`;
    } else c.note = `Next routine test due on ${due.dueDay}.`;
    checks.push(c);
  }

  // Probe health findings of the unit's probes.
  for (const h of f.health) {
    const p = probeById.get(h.probeId);
    const label = p?.label ?? 'probe';
    const key = (kind: AlertKind, q?: string) => (q ? `${kind}:${h.probeId}:${q}` : `${kind}:${h.probeId}`);
    const silentCheck = base('probe_silent', key('probe_silent'), h.probeId);
    const silent = h.findings.find((x): x is Extract<ProbeFindingLike, { kind: 'silent' }> => x.kind === 'silent');
    const maintenance = h.findings.find((x): x is Extract<ProbeFindingLike, { kind: 'maintenance' }> => x.kind === 'maintenance');
    silentCheck.rule = {
      metric: null,
      threshold: silent?.thresholdSeconds ?? null,
      watch: silent?.thresholdSeconds ?? null,
      act: silent ? silent.thresholdSeconds * EVALUATION_RULES.silentActFactor : null,
      basis: 'seconds without a reading',
      source: `farm setting: silent after ${settings.silentAfterMissedIntervals} missed reporting intervals; act after ${EVALUATION_RULES.silentActFactor}× that (product decision)`,
      clearsAt: null,
      salinityPpt: null,
      profileId: null,
      profileName: null,
    };
    if (h.state === 'inactive') silentCheck.note = 'The probe is deactivated.';
    else if (maintenance) {
      silentCheck.note = `In a maintenance window until ${maintenance.endsAt} (${maintenance.reason}).`;
      silentCheck.values = { maintenance: { windowId: maintenance.windowId, reason: maintenance.reason, endsAt: maintenance.endsAt } };
    } else if (silent) {
      silentCheck.value = silent.silentForSeconds;
      silentCheck.valueUnit = 'seconds';
      silentCheck.source = 'probe health';
      silentCheck.at = silent.lastReadingAt ? new Date(silent.lastReadingAt) : null;
      silentCheck.values = { lastReadingAt: silent.lastReadingAt, silentForSeconds: silent.silentForSeconds, thresholdSeconds: silent.thresholdSeconds, intervalSeconds: p?.intervalSeconds ?? null };
      if (ctx.farmSilent) {
        silentCheck.verdict = 'hold';
        silentCheck.note = 'The whole farm is silent: one farm alarm instead of one per probe.';
      } else {
        silentCheck.verdict = 'raise';
        silentCheck.level = silent.silentForSeconds > silent.thresholdSeconds * EVALUATION_RULES.silentActFactor ? 'act' : 'watch';
        silentCheck.title = `${kindTitles.probe_silent}: ${label} (${unit.name})`;
        silentCheck.message = `${label} has sent nothing for ${duration(silent.silentForSeconds)}${silent.lastReadingAt ? ` (last reading at ${localHhmm(new Date(silent.lastReadingAt), tz)})` : ''}; it counts as silent after ${duration(silent.thresholdSeconds)}. Check power, battery and radio.`;
      }
      holdPrefixes.push(`flatline:${h.probeId}:`, `spike:${h.probeId}:`, `drift:${h.probeId}:`);
    } else silentCheck.note = 'Reporting.';
    checks.push(silentCheck);
    if (h.state === 'inactive') continue;

    for (const finding of h.findings) {
      if (finding.kind === 'silent' || finding.kind === 'maintenance') continue;
      const c = base(finding.kind, key(finding.kind, finding.quantity), h.probeId);
      const q = QUANTITY_LABELS[finding.quantity] ?? finding.quantity;
      c.verdict = 'raise';
      c.level = 'watch';
      c.source = 'probe health';
      c.values = { ...finding };
      c.title = `${kindTitles[finding.kind]}: ${label} ${q} (${unit.name})`;
      const rule = (source: string, threshold: number | null = null, basis: string | null = null): AlertRule => ({ metric: null, threshold, watch: threshold, act: null, basis, source, clearsAt: null, salinityPpt: null, profileId: null, profileName: null });
      if (finding.kind === 'flatline') {
        c.value = finding.value;
        c.at = new Date(finding.sinceAt);
        c.rule = rule('product decision: 30 identical readings over at least 30 min (probe health rules)');
        c.message = `${label} has reported ${q} ${finding.value} unchanged ${finding.readings} times over ${finding.minutes} min. The sensor may be stuck: check it against a handheld meter.`;
      } else if (finding.kind === 'spike') {
        c.value = finding.suspectCount;
        c.at = new Date(finding.lastAt);
        c.rule = rule('product decision: readings flagged suspect at ingest (implausible step) in the last 24 h');
        c.message = `${label}: ${finding.suspectCount} implausible ${q} reading(s) in the last 24 h (flagged suspect, not used for alarms). Check the sensor and its cable.`;
      } else if (finding.kind === 'drift') {
        c.value = finding.meanDifference;
        c.rule = rule('husbandry.md §5: a steady divergence from handheld values marks readings suspect (threshold product decision)', finding.threshold, q);
        c.message = `${label} reads ${q} ${finding.meanDifference > 0 ? 'high' : 'low'} by ${Math.abs(finding.meanDifference)} against handheld checks (mean of ${finding.pairs}; limit ${finding.threshold}). Clean and recalibrate.`;
      } else {
        c.at = finding.nextDueAt ? new Date(finding.nextDueAt) : null;
        c.rule = rule('husbandry.md §5: continuous probes recalibrated monthly (common practice)');
        c.message = finding.nextDueAt
          ? `${label}: ${q} calibration was due on ${localParts(new Date(finding.nextDueAt), tz).day}.`
          : `${label}: no ${q} calibration is recorded.`;
      }
      checks.push(c);
    }
  }

  return { checks, holdPrefixes, scopeNote: 'No longer evaluated (rule removed, probe moved or removed).', dawnProjection, epa };
}

/** US EPA 2013 criteria at the unit's current pH and temperature (fresh water only): reference, never an alarm. */
function epaReference(f: UnitFacts, ctx: FarmContext): EpaReference {
  const source = 'US EPA 2013, EPA 822-R-13-001 (equations from memory, reproduce the published values): ambient criteria for natural waters, a reference line, not a culture limit';
  const present = oncorhynchus(f.unit.species);
  const empty = { pH: null, temperatureC: null, cmcMgL: null, cccMgL: null, fourDayMaxMgL: null };
  const latestTanMgL = f.latestOkResult?.tanMgL ?? null;
  if (f.unit.waterType !== 'fresh') return { applicable: false, note: 'The EPA 2013 criteria are for fresh water.', oncorhynchusPresent: present, latestTanMgL, source, ...empty };
  const freshMs = (l: Latest | undefined) => (l && ctx.now.getTime() - l.at.getTime() <= 6 * HOUR ? l.value : null);
  const pH = freshMs(f.latest.ph) ?? f.latestOkResult?.ph ?? null;
  const t = freshMs(f.latest.water_temperature) ?? f.latestOkResult?.temperatureC ?? null;
  if (pH === null || t === null) return { applicable: false, note: 'Needs a current pH and temperature.', oncorhynchusPresent: present, latestTanMgL, source, ...empty, pH, temperatureC: t };
  if (pH < EPA2013_RANGE.pH.min || pH > EPA2013_RANGE.pH.max || t < EPA2013_RANGE.temperatureC.min || t > EPA2013_RANGE.temperatureC.max) {
    return { applicable: false, note: 'pH or temperature outside the range of the EPA 2013 tables (pH 6.5–9.0, 0–30 °C).', oncorhynchusPresent: present, latestTanMgL, source, ...empty, pH, temperatureC: t };
  }
  const c = epa2013Criteria({ pH, temperatureC: t, oncorhynchusPresent: present });
  return {
    applicable: true,
    note: `Reference lines at pH ${round(pH, 2)} and ${round(t, 1)} °C (${present ? 'Oncorhynchus present' : 'Oncorhynchus absent'}), mg TAN/L.`,
    pH: round(pH, 3),
    temperatureC: round(t, 2),
    oncorhynchusPresent: present,
    cmcMgL: round(c.cmcMgL, 4),
    cccMgL: round(c.cccMgL, 4),
    fourDayMaxMgL: round(c.fourDayMaxMgL, 4),
    latestTanMgL,
    source,
  };
}

/** Farm-level silence: every deployed, active probe not in maintenance is silent. */
export function farmSilenceCheck(health: ProbeHealthLike[], ctx: Pick<FarmContext, 'timeZone' | 'settings'>, farmName: string): Check {
  const watched = health.filter((h) => h.unitId !== null && h.state !== 'inactive' && h.state !== 'maintenance');
  const silent = watched.filter((h) => h.state === 'silent');
  const c: Check = {
    kind: 'farm_silent',
    conditionKey: 'farm_silent',
    verdict: 'clear',
    level: null,
    unitId: null,
    probeId: null,
    value: silent.length,
    valueUnit: 'silent probes',
    at: null,
    source: 'probe health',
    rule: { metric: null, threshold: null, watch: null, act: null, basis: null, source: `product.md: silence must raise alarms; farm setting: silent after ${ctx.settings.silentAfterMissedIntervals} missed intervals`, clearsAt: null, salinityPpt: null, profileId: null, profileName: null },
    title: null,
    message: null,
    note: null,
    values: { probes: watched.length, silent: silent.length },
  };
  if (watched.length > 0 && silent.length === watched.length) {
    const last = silent.map((h) => (h.lastReadingAt ? Date.parse(h.lastReadingAt) : 0)).reduce((a, b) => Math.max(a, b), 0);
    c.verdict = 'raise';
    c.level = 'act';
    c.at = last ? new Date(last) : null;
    c.values = { ...c.values, lastReadingAt: last ? new Date(last).toISOString() : null };
    c.title = `${kindTitles.farm_silent}: ${farmName}`;
    c.message = `None of the farm's ${watched.length} probe(s) has reported${last ? ` since ${localHhmm(new Date(last), ctx.timeZone)}` : ''}. Check the power, the network and the server's MQTT broker; check the ponds by hand meanwhile.`;
  } else c.note = watched.length ? `${watched.length - silent.length} of ${watched.length} probe(s) reporting.` : 'No deployed probes.';
  return c;
}

/**
 * Map status of a unit from its open alerts: act > silent > watch > clear. Silent when every active
 * probe of the unit has an open probe_silent alert (or the farm is silent); fallow units are clear.
 */
export function unitStatusOf(input: {
  fallow: boolean;
  activeProbeIds: string[];
  farmSilent: boolean;
  alerts: Array<{ kind: string; level: AlertLevel; probeId: string | null }>;
}): UnitStatusLevel {
  if (input.fallow) return 'clear';
  const counted = input.alerts.filter((a) => !statusNeutralKinds.includes(a.kind as AlertKind));
  const silentProbes = new Set(counted.filter((a) => a.kind === 'probe_silent' && a.probeId).map((a) => a.probeId as string));
  const allSilent = input.activeProbeIds.length > 0 && (input.farmSilent || input.activeProbeIds.every((id) => silentProbes.has(id)));
  const others = allSilent ? counted.filter((a) => a.kind !== 'probe_silent') : counted;
  if (others.some((a) => a.level === 'act')) return 'act';
  if (allSilent) return 'silent';
  if (others.length) return 'watch';
  return 'clear';
}
