// The feed-cut rule: a documented, configurable product decision (docs/feeding.md). Pure and
// isomorphic. Reducing or stopping feed when ammonia is high follows SRAC 4603 (qualitative); the
// step sizes (25 / 50 %, skip a day) are common practice, not a published numeric rule.

/** Bump when the meaning of a default or of a step changes; stored with every recommendation. */
export const FEED_RULE_VERSION = 'gillwise-feed-rule/1';

export type FeedRule = {
  /** Species → dissolved oxygen (mg/L) below which fish are not fed (husbandry §1). */
  criticalDoMgL: Record<string, number>;
  /** DO must be this much above the critical level again before feeding resumes after a low dawn. */
  doRecoveryMarginMgL: number;
  /** Hours either side of the farm's dawn time that count as "at dawn". */
  dawnWindowHours: number;
  /** A DO reading older than this does not count as the latest. */
  doMaxAgeHours: number;
  /** Open alerts of these kinds on the unit withhold feed (act level) or are noted (watch level). */
  doAlertKinds: string[];
  ammonia: {
    watchCutPct: number;
    actCutPct: number;
    /** Added to an ammonia cut when the last `trendResults` free-ammonia results rise one after another. */
    risingExtraCutPct: number;
    trendResults: number;
    /** Ammonia cuts never exceed this (a full stop comes from the other rules). */
    maxCutPct: number;
    /** A result older than this is reported, not acted on. */
    maxResultAgeHours: number;
  };
  treatment: {
    /** Within this many hours after a treatment ends: skip feeding. */
    skipWithinHours: number;
    /** Within this many hours: cut by `cutPct`. */
    cutWithinHours: number;
    cutPct: number;
  };
  /** Observations today that mean a suspected die-off: withhold. */
  dieOffKinds: string[];
  /** Observations in the last 24 h that are noted beside the ration. */
  noteKinds: string[];
  raceway: {
    /** Flow below this fraction of the design flow counts as reduced. */
    reducedFlowFraction: number;
    reducedFlowCutPct: number;
    /** TAN of the inflow, mg/L (0 for clean spring water). */
    inletTanMgL: number;
    /** A probe flow reading older than this is passed over for the latest hand measurement. */
    flowReadingMaxAgeHours: number;
  };
  loading: {
    /** Piper et al. 1982 density index, kg/(m³·cm) (0.5 lb/(ft³·in)). */
    densityIndexMax: number;
    /** Piper et al. 1982 flow index, kg/((L/min)·cm) (1.5 lb/(gpm·in)). */
    flowIndexMax: number;
    /** Species → density cap, kg/m³. */
    densityCapKgPerM3: Record<string, number>;
    minExchangesPerHour: number;
  };
  /** Species → linear scaling of the table ration between a zero and a full-ration temperature. */
  temperatureScaling: Record<string, { zeroAtC: number; fullAtC: number; source: string }>;
  /** Defaults for the hatchery-constant method when the table row does not carry its own. */
  hatcheryConstant: { fcr: number; dailyLengthGainCm: number };
  /** Hours of probe water temperature averaged for the day's ration. */
  temperatureMeanHours: number;
  /** Days after which a mean weight is called old on the ration sheet. */
  weightStaleDays: number;
};

export const defaultFeedRule: FeedRule = {
  criticalDoMgL: { channel_catfish: 2.0, nile_tilapia: 2.3, rainbow_trout: 5.0, whiteleg_shrimp: 3.0 },
  doRecoveryMarginMgL: 1.0,
  dawnWindowHours: 2,
  doMaxAgeHours: 6,
  doAlertKinds: ['do_low', 'do_projected_low'],
  ammonia: { watchCutPct: 25, actCutPct: 50, risingExtraCutPct: 25, trendResults: 3, maxCutPct: 75, maxResultAgeHours: 8 * 24 },
  treatment: { skipWithinHours: 24, cutWithinHours: 48, cutPct: 25 },
  dieOffKinds: ['dead_fish', 'gasping'],
  noteKinds: ['off_feed'],
  raceway: { reducedFlowFraction: 0.8, reducedFlowCutPct: 25, inletTanMgL: 0, flowReadingMaxAgeHours: 6 },
  loading: { densityIndexMax: 3.153, flowIndexMax: 0.0708, densityCapKgPerM3: { rainbow_trout: 72 }, minExchangesPerHour: 2 },
  temperatureScaling: {
    nile_tilapia: { zeroAtC: 17.2, fullAtC: 29, source: 'SRAC 283 bands (published); linear scaling between them is a product decision' },
  },
  hatcheryConstant: { fcr: 1.2, dailyLengthGainCm: 0.1 },
  temperatureMeanHours: 24,
  weightStaleDays: 14,
};

/** Where each part of the rule comes from; shown with the reasons. */
export const feedRuleSources = {
  ammonia: 'SRAC 4603 (qualitative: reduce or stop feeding when ammonia is high); step sizes common practice',
  do: 'husbandry §1 critical DO by species (Cole & Boyd; Piper et al. 1982; Boyd); do not feed when DO is low (common practice)',
  temperature: 'feeding table of the species (its own source label)',
  treatment: 'common practice: skip a day or cut 25–50 % after a treatment',
  dieOff: 'common practice: withhold feed when a die-off is suspected',
  flow: 'husbandry §2: reduced raceway flow is a reason to cut (common practice); step size common practice',
  ammoniaLoad: 'TAN = feed × protein × 0.092 (Timmons & Ebeling, from memory); ΔTAN = P × 10⁶ / (Q × 1440) (mass balance)',
  loading: 'Piper et al. 1982 density and flow indices (published rules of thumb)',
} as const;

type DeepPartial<T> = { [K in keyof T]?: T[K] extends Record<string, unknown> ? DeepPartial<T[K]> : T[K] };
export type FeedRuleOverrides = DeepPartial<FeedRule>;

const isPlainObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** The defaults with a farm's overrides laid over them (objects merge key by key; arrays and numbers replace). */
export function mergeFeedRule(overrides: FeedRuleOverrides | null | undefined, base: FeedRule = defaultFeedRule): FeedRule {
  const merge = (a: unknown, b: unknown): unknown => {
    if (b === undefined) return a;
    if (isPlainObject(a) && isPlainObject(b)) {
      const out: Record<string, unknown> = { ...a };
      for (const [k, v] of Object.entries(b)) out[k] = merge(a[k], v);
      return out;
    }
    return b;
  };
  return merge(base, overrides ?? {}) as FeedRule;
}

// ---------------------------------------------------------------------------------------------
// The decision: signals in, action and reasons out.

export type FeedAction = 'feed' | 'cut' | 'withhold';
export type ReasonEffect = 'withhold' | 'cut' | 'cap' | 'note';
export type FeedReason = { code: string; text: string; source: string | null; effect: ReasonEffect };

export type PlanStatus = 'ok' | 'not_feeding_day' | 'out_of_band' | 'no_plan';

export type FeedSignals = {
  species: string;
  /** The table ration for this day (0 on a rest day or outside the band). */
  plannedKg: number;
  plan: { status: PlanStatus; text: string };
  oxygen: {
    criticalMgL: number | null;
    latest: { mgL: number; localTime: string } | null;
    dawnLow: { mgL: number; localTime: string } | null;
    openAlerts: Array<{ kind: string; level: 'watch' | 'act'; title: string }>;
  };
  ammonia: {
    /** Levels as NH3 (mg/L), from the unit's threshold profile. */
    watchNh3MgL: number | null;
    actNh3MgL: number | null;
    latest: { nh3MgL: number; localTime: string; day: string; ageHours: number; flags?: string[] | undefined } | null;
    forecast: { nh3MgL: number; localTime: string; day: string } | null;
    /** Oldest → newest NH3 of the last results (for the trend). */
    recentNh3MgL: number[];
  };
  treatment: { label: string; hoursSinceEnd: number } | null;
  dieOff: { kind: string; localTime: string; count: number | null } | null;
  notes: Array<{ kind: string; localTime: string; detail: string | null }>;
  raceway: {
    flowLpm: number | null;
    flowSource: string | null;
    designFlowLpm: number | null;
    /** Outlet NH3 the planned ration would give at this flow, mg/L NH3. */
    plannedNh3MgL: number | null;
    plannedTanRiseMgL: number | null;
    targetNh3MgL: number | null;
    maxFeedKg: number | null;
    pH: number | null;
    temperatureC: number | null;
  } | null;
};

export type FeedDecision = {
  action: FeedAction;
  /** Percent below the planned ration (0–100). */
  cutPct: number;
  recommendedKg: number;
  reasons: FeedReason[];
};

const fmt = (v: number, digits: number) => v.toFixed(digits);
const nh3 = (v: number) => fmt(v, 3);
const kg = (v: number) => (v >= 100 ? Math.round(v).toLocaleString('en-US') : fmt(v, 1));
const lpm = (v: number) => Math.round(v).toLocaleString('en-US');
export const speciesLabel = (s: string) => s.replace(/_/g, ' ');
const roundKg = (v: number) => Math.round(v * 10) / 10;

/** Whether NH3 readings rise one after another over the last `n` results. */
export function isRising(values: number[], n: number): boolean {
  const last = values.slice(-n);
  if (last.length < n || n < 2) return false;
  return last.every((v, i) => i === 0 || v > last[i - 1]!);
}

/**
 * The recommendation for one unit and day. Withholding reasons win; otherwise the largest single cut
 * applies (cuts do not add up), then the raceway's ammonia-load cap. Every finding is a reason.
 */
export function decideFeed(s: FeedSignals, rule: FeedRule): FeedDecision {
  const d = decide(s, rule);
  // What decides comes first: withholding, then cuts, then caps, then notes (each group in rule order).
  const order: Record<ReasonEffect, number> = { withhold: 0, cut: 1, cap: 2, note: 3 };
  const reasons = d.reasons.map((r, i) => ({ r, i })).sort((a, b) => order[a.r.effect] - order[b.r.effect] || a.i - b.i).map((x) => x.r);
  return { ...d, reasons };
}

function decide(s: FeedSignals, rule: FeedRule): FeedDecision {
  const reasons: FeedReason[] = [];
  const add = (code: string, effect: ReasonEffect, text: string, source: string | null, pct = 0) => {
    reasons.push({ code, text, source, effect });
    return pct;
  };
  const cuts: number[] = [];
  const caps: number[] = [];
  const species = speciesLabel(s.species);

  // The plan itself: rest day, outside the feeding band, or no plan possible.
  if (s.plan.status === 'not_feeding_day') add('not_feeding_day', 'withhold', s.plan.text, feedRuleSources.temperature);
  if (s.plan.status === 'out_of_band') add('temperature_out_of_band', 'withhold', s.plan.text, feedRuleSources.temperature);
  if (s.plan.status === 'no_plan') add('no_plan', 'withhold', s.plan.text, null);

  // Dissolved oxygen: withhold while it is below the critical level, and after a low dawn until it recovers.
  const o = s.oxygen;
  if (o.criticalMgL !== null) {
    const crit = o.criticalMgL;
    const recovered = crit + rule.doRecoveryMarginMgL;
    if (o.latest && o.latest.mgL < crit) {
      add('do_low', 'withhold', `DO ${fmt(o.latest.mgL, 1)} mg/L at ${o.latest.localTime}, below the ${fmt(crit, 1)} mg/L critical level for ${species}; withhold until it recovers`, feedRuleSources.do);
    } else if (o.dawnLow && o.dawnLow.mgL < crit) {
      if (o.latest && o.latest.mgL >= recovered) {
        add('do_recovered', 'note', `DO fell to ${fmt(o.dawnLow.mgL, 1)} mg/L at ${o.dawnLow.localTime} (dawn) and has recovered to ${fmt(o.latest.mgL, 1)} at ${o.latest.localTime}; feed after mid-morning`, feedRuleSources.do);
      } else {
        const now = o.latest ? `; ${fmt(o.latest.mgL, 1)} at ${o.latest.localTime}, not yet back to ${fmt(recovered, 1)}` : '; no reading since';
        add('do_low_dawn', 'withhold', `DO ${fmt(o.dawnLow.mgL, 1)} mg/L at ${o.dawnLow.localTime} (dawn), below the ${fmt(crit, 1)} mg/L critical level for ${species}${now}; withhold until it recovers`, feedRuleSources.do);
      }
    }
  }
  for (const a of o.openAlerts) {
    if (a.level === 'act') add('do_alert', 'withhold', `Open alert: ${a.title}; withhold until it is resolved`, feedRuleSources.do);
    else add('do_alert_watch', 'note', `Open alert (watch): ${a.title}`, feedRuleSources.do);
  }

  // Suspected die-off today.
  if (s.dieOff) {
    const what = s.dieOff.kind === 'gasping' ? 'Fish gasping' : 'Dead fish';
    const n = s.dieOff.count ? ` (${s.dieOff.count})` : '';
    add('die_off', 'withhold', `${what} seen at ${s.dieOff.localTime} today${n}: suspected die-off; withhold until the cause is known`, feedRuleSources.dieOff);
  }
  for (const n of s.notes) {
    add(`observed_${n.kind}`, 'note', `${speciesLabel(n.kind).replace(/^./, (c) => c.toUpperCase())} noted at ${n.localTime}${n.detail ? `: ${n.detail}` : ''}`, null);
  }

  // A recent treatment.
  if (s.treatment) {
    const h = Math.max(0, Math.round(s.treatment.hoursSinceEnd));
    if (s.treatment.hoursSinceEnd <= rule.treatment.skipWithinHours) {
      add('treatment_recent', 'withhold', `${s.treatment.label} ${h} h ago: skip feeding (within ${rule.treatment.skipWithinHours} h of a treatment)`, feedRuleSources.treatment);
    } else if (s.treatment.hoursSinceEnd <= rule.treatment.cutWithinHours) {
      cuts.push(add('treatment_recent', 'cut', `${s.treatment.label} ${h} h ago; cut ${rule.treatment.cutPct} % (within ${rule.treatment.cutWithinHours} h of a treatment)`, feedRuleSources.treatment, rule.treatment.cutPct));
    }
  }

  // Free ammonia: the higher of the latest result and today's forecast peak against the profile's levels.
  const a = s.ammonia;
  if (!a.latest) {
    add('no_ammonia_result', 'note', 'No free-ammonia result to go on (a kit TAN needs a pH and temperature to count); test TAN before relying on this ration', null);
  } else if (a.latest.ageHours > rule.ammonia.maxResultAgeHours) {
    add('ammonia_result_old', 'note', `The latest free-ammonia result is ${Math.round(a.latest.ageHours / 24)} days old (NH3 ${nh3(a.latest.nh3MgL)} mg/L); test TAN before relying on this ration`, null);
  } else if (a.actNh3MgL !== null || a.watchNh3MgL !== null) {
    const useForecast = a.forecast !== null && a.forecast.nh3MgL > a.latest.nh3MgL;
    const level = useForecast ? a.forecast!.nh3MgL : a.latest.nh3MgL;
    const when = useForecast
      ? `forecast at ${a.forecast!.localTime}${a.forecast!.day !== a.latest.day ? ` on ${a.forecast!.day}` : ''}`
      : `measured at ${a.latest.localTime}${a.latest.ageHours >= 24 ? ` on ${a.latest.day}` : ''}`;
    const rising = isRising(a.recentNh3MgL, rule.ammonia.trendResults);
    const trendText = `rising over the last ${rule.ammonia.trendResults} results (${a.recentNh3MgL.slice(-rule.ammonia.trendResults).map(nh3).join(' → ')} mg/L)`;
    let cut = 0;
    if (a.actNh3MgL !== null && level >= a.actNh3MgL) {
      cut = rule.ammonia.actCutPct;
      add('nh3_act', 'cut', `NH3 ${nh3(level)} mg/L ${when}; act level ${nh3(a.actNh3MgL)}; cut ${cut} %`, feedRuleSources.ammonia);
    } else if (a.watchNh3MgL !== null && level >= a.watchNh3MgL) {
      cut = rule.ammonia.watchCutPct;
      add('nh3_watch', 'cut', `NH3 ${nh3(level)} mg/L ${when}; watch level ${nh3(a.watchNh3MgL)}; cut ${cut} %`, feedRuleSources.ammonia);
    } else if (rising) {
      add('nh3_rising', 'note', `NH3 ${trendText}, still under the watch level`, feedRuleSources.ammonia);
    }
    if (cut > 0 && rising) {
      const more = Math.min(rule.ammonia.maxCutPct, cut + rule.ammonia.risingExtraCutPct) - cut;
      if (more > 0) {
        add('nh3_rising', 'cut', `NH3 ${trendText}; cut ${more} % more`, feedRuleSources.ammonia);
        cut += more;
      }
    }
    if (cut > 0) cuts.push(Math.min(cut, rule.ammonia.maxCutPct));
    // A kit flag (e.g. Nessler after formalin) does not lift a cut; it says the number may be high.
    for (const flag of a.latest.flags ?? []) add('nh3_result_flagged', 'note', `About the latest result: ${flag}`, null);
  }

  // Raceways: reduced flow, and the ammonia the planned ration would add at the current flow.
  const r = s.raceway;
  if (r) {
    if (r.flowLpm === null) {
      add('flow_unknown', 'note', 'No flow reading or measurement: the ammonia load could not be checked against the flow', feedRuleSources.flow);
    } else {
      const reduced = r.designFlowLpm !== null && r.flowLpm < rule.raceway.reducedFlowFraction * r.designFlowLpm;
      const pctOfDesign = r.designFlowLpm ? Math.round((r.flowLpm / r.designFlowLpm) * 100) : null;
      if (reduced) {
        cuts.push(add('flow_reduced', 'cut', `Flow ${lpm(r.flowLpm)} L/min (${r.flowSource ?? 'latest'}), ${pctOfDesign} % of the ${lpm(r.designFlowLpm!)} L/min design; cut ${rule.raceway.reducedFlowCutPct} %`, feedRuleSources.flow, rule.raceway.reducedFlowCutPct));
      }
      if (s.plannedKg > 0 && r.plannedNh3MgL !== null && r.targetNh3MgL !== null && r.maxFeedKg !== null && r.plannedTanRiseMgL !== null) {
        const at = r.pH !== null && r.temperatureC !== null ? ` at pH ${fmt(r.pH, 1)}, ${fmt(r.temperatureC, 1)} °C` : '';
        const load = `At ${lpm(r.flowLpm)} L/min the planned ${kg(s.plannedKg)} kg adds ${fmt(r.plannedTanRiseMgL, 2)} mg/L TAN → NH3 ${nh3(r.plannedNh3MgL)} mg/L${at}`;
        if (r.plannedNh3MgL > r.targetNh3MgL) {
          caps.push(r.maxFeedKg);
          const why = reduced ? '; flow is reduced vs design' : '';
          add('ammonia_load', 'cap', `${load}, over the ${nh3(r.targetNh3MgL)} mg/L target; at most ${kg(r.maxFeedKg)} kg keeps it under${why}`, feedRuleSources.ammoniaLoad);
        } else {
          add('ammonia_load', 'note', `${load}, under the ${nh3(r.targetNh3MgL)} mg/L target (at most ${kg(r.maxFeedKg)} kg)`, feedRuleSources.ammoniaLoad);
        }
      }
    }
  }

  const withholds = reasons.filter((x) => x.effect === 'withhold');
  const planned = Math.max(0, s.plannedKg);
  if (withholds.length || planned === 0) {
    return { action: planned > 0 || withholds.length ? 'withhold' : 'feed', cutPct: planned > 0 ? 100 : 0, recommendedKg: 0, reasons };
  }
  const cutPct = Math.min(100, Math.max(0, ...cuts));
  const afterCut = planned * (1 - cutPct / 100);
  let recommended = afterCut;
  for (const cap of caps) recommended = Math.min(recommended, Math.max(0, cap));
  const capBinds = recommended < afterCut;
  recommended = roundKg(recommended);
  if (recommended <= 0) return { action: 'withhold', cutPct: 100, recommendedKg: 0, reasons };
  // The rule's step when no cap binds (kg rounding aside); the effective cut when the cap goes further.
  const effectiveCut = capBinds ? Math.round((1 - recommended / planned) * 1000) / 10 : cutPct;
  if (effectiveCut < 0.5) {
    if (!reasons.some((x) => x.effect === 'cut' || x.effect === 'cap')) {
      reasons.unshift({ code: 'full_ration', text: 'No rule calls for a cut today', source: null, effect: 'note' });
    }
    return { action: 'feed', cutPct: 0, recommendedKg: roundKg(planned), reasons };
  }
  return { action: 'cut', cutPct: effectiveCut, recommendedKg: recommended, reasons };
}
