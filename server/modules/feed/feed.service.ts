import {
  ChemistryInputError,
  maxFeedKgPerDay,
  racewayCapacityKg,
  racewayTanRiseMgL,
  tanProductionKgPerDay,
  unionizedFraction,
  densityIndex,
  flowIndex,
  type AmmoniaMethod,
} from '../../../shared/chemistry';
import { addDays, daysBetween, hhmm, localDay, localParts, zonedTime } from '../../../shared/farm-time';
import {
  decideFeed,
  FEED_RULE_VERSION,
  feedRuleSources,
  mergeFeedRule,
  nh3Levels,
  planRation,
  type FeedDecision,
  type FeedReason,
  type FeedRule,
  type FeedSignals,
  type FeedTableRow,
  type ProfileRule,
  type RationPlan,
} from '../../../shared/feed';
import { feedRuleOverridesFrom, type AmmoniaLoadDto, type LoadingDto, type OverrideRecommendation, type RationPlanDto } from '../../../shared/schemas/feed.schema';
import { NH3_PER_NH3_N } from '../../../shared/units';
import type { CultureUnit, FarmSettings, FeedingRecord, FeedingTable, FeedRecommendation, FreeAmmoniaResult, Observation, Treatment } from '../../db/entities';
import { badRequest, notFound } from '../../http/errors';
import type { Logger } from '../../lib/logger';
import type { LiveService } from '../live/live.service';
import { presentEstimate } from '../stock/stock.presenter';
import type { AuditRecorder, FarmDirectory, StockService, UnitDirectory, UnitEstimate } from '../stock/stock.service';
import type { FeedingTablesService } from './feeding-tables.service';
import type { FeedingsService } from './feedings.service';
import type { FeedRepository, ProposalRow } from './feed.repository';

const HOUR = 3_600_000;
const DAY = 24 * HOUR;
/** Recommendations can be computed for this many days back, and for tomorrow. */
const PAST_DAYS = 30;

/** The parts of other modules' services the feed module reads. */
export type AmmoniaResults = {
  list(farmId: string, unitId: string, q: { analyte?: string; to?: string; limit: number }): Promise<Array<{ result: FreeAmmoniaResult | null }>>;
};
export type RecentTreatments = { recent(farmId: string, unitId: string, sinceMs: number, now?: Date): Promise<Treatment[]> };
export type UnitObservations = { list(farmId: string, unitId: string): Promise<Observation[]> };
/** The units module's current and design flow of a unit. */
export type UnitFlows = {
  latestFlowLpm(unitId: string): Promise<{ flowLpm: number; at: Date; source: 'probe' | 'manual' | 'design' } | null>;
  designFlowLpm(unitId: string): Promise<number | null>;
};
/** The alerts module's open (and acknowledged) alerts of a unit. */
export type AlertSource = {
  activeAlerts(farmId: string, filter: { unitId?: string; kinds?: string[] }): Promise<Array<{ id: string; kind: string; level: 'watch' | 'act'; title: string; openedAt: string }>>;
};

/** What the feed module needs to know of a farm. */
export type FarmContext = { id: string; timeZone: string; settings: FarmSettings };

export type TemperatureBasis = RationPlanDto['temperature'];

/** Everything worked out for one unit and day, before anything is stored. */
export type UnitPlan = {
  day: string;
  today: string;
  refAt: Date;
  farm: FarmContext;
  unit: CultureUnit;
  rule: FeedRule;
  biomass: UnitEstimate;
  table: FeedingTable | null;
  plan: RationPlan;
  planDto: RationPlanDto;
  loading: LoadingDto;
  ammoniaLoad: AmmoniaLoadDto;
  signals: FeedSignals;
  decision: FeedDecision;
  inputs: Record<string, unknown>;
};

const round = (v: number | null, d: number): number | null => (v === null || !Number.isFinite(v) ? null : Math.round(v * 10 ** d) / 10 ** d);
const roundKg = (v: number) => Math.round(v * 10) / 10;

type LaterProposal = {
  computedAt: string;
  action: FeedRecommendation['action'];
  cutPct: number;
  plannedKg: number;
  plannedPctBw: number;
  biomassKg: number;
  recommendedKg: number;
  reasons: FeedReason[];
  ruleVersion: string;
  inputs: Record<string, unknown>;
};

export const RATION_CAUTION =
  'Feed cuts are recommendations for the feed planner to accept or override, never automatic. Fish-health decisions rest with the farm’s veterinarian or fish-health professional.';

export class FeedService {
  constructor(
    private readonly repo: FeedRepository,
    private readonly farms: FarmDirectory,
    private readonly units: UnitDirectory & UnitFlows,
    private readonly stock: StockService,
    private readonly feedings: FeedingsService,
    private readonly tables: FeedingTablesService,
    private readonly results: AmmoniaResults,
    private readonly treatments: RecentTreatments,
    private readonly observations: UnitObservations,
    private readonly live: LiveService,
    private readonly audit: AuditRecorder,
    private readonly logger: Logger,
  ) {}

  private alertSource: AlertSource | null = null;

  /** Installed by the composition root once the alerts module is wired; until then open alerts are read directly. */
  useAlertSource(source: AlertSource): void {
    this.alertSource = source;
  }

  private async farmOrThrow(farmId: string): Promise<FarmContext> {
    const [settings, timeZone] = await Promise.all([this.farms.getSettings(farmId), this.farms.timeZone(farmId)]);
    return { id: farmId, timeZone, settings };
  }

  private async openDoAlerts(farmId: string, unitId: string, kinds: string[]): Promise<Array<{ id: string; kind: string; level: 'watch' | 'act'; title: string; openedAt: string }>> {
    if (this.alertSource) return this.alertSource.activeAlerts(farmId, { unitId, kinds });
    return (await this.repo.openAlerts(unitId, kinds)).map((a) => ({ id: a.id, kind: a.kind, level: a.level, title: a.title, openedAt: a.openedAt.toISOString() }));
  }

  /** The farm-local day asked for (today by default), checked to be within the days rations are kept for. */
  private dayOf(farm: FarmContext, day: string | undefined, now: Date): { day: string; today: string; refAt: Date } {
    const today = localDay(now, farm.timeZone);
    const d = day ?? today;
    const offset = daysBetween(today, d);
    if (offset > 1 || offset < -PAST_DAYS) {
      throw badRequest(`Rations can be worked out from ${addDays(today, -PAST_DAYS)} to ${addDays(today, 1)} (farm-local days).`, { fieldErrors: { day: ['out of range'] } }, 'validation_failed');
    }
    // A past day is judged by what was known at its end; today and tomorrow by what is known now.
    const refAt = d < today ? new Date(zonedTime(addDays(d, 1), 0, 0, farm.timeZone).getTime() - 1) : now;
    return { day: d, today, refAt };
  }

  /** Works out one unit's ration, loading, ammonia load and proposal for a day. Stores nothing. */
  async planUnit(farmId: string, unitId: string, dayIn?: string, now = new Date()): Promise<UnitPlan> {
    const farm = await this.farmOrThrow(farmId);
    const unit = await this.units.require(farmId, unitId);
    const { day, today, refAt } = this.dayOf(farm, dayIn, now);
    const tz = farm.timeZone;
    const local = (d: Date) => {
      const p = localParts(d, tz);
      return hhmm(p.hour, p.minute);
    };
    const rule = mergeFeedRule(feedRuleOverridesFrom(farm.settings));
    const settings = farm.settings;
    const species = unit.species ?? 'unknown';

    const [biomass, table, probeIds, profile, okResults] = await Promise.all([
      this.stock.estimate(farmId, unitId, refAt),
      unit.species ? this.tables.forSpecies(farmId, unit.species) : Promise.resolve(null),
      this.repo.probeIdsOfUnit(unitId),
      unit.thresholdProfileId ? this.repo.findProfile(unit.thresholdProfileId) : Promise.resolve(null),
      this.results
        .list(farmId, unitId, { analyte: 'total_ammonia', to: refAt.toISOString(), limit: 12 })
        .then((rows) => rows.map((r) => r.result).filter((r): r is FreeAmmoniaResult => r !== null && r.status === 'ok' && r.nh3MgL !== null)),
    ]);
    okResults.sort((a, b) => b.sampledAt.getTime() - a.sampledAt.getTime());
    const latestResult = okResults[0] ?? null;

    // Water temperature for the ration: the mean of the last 24 h of probe readings, else the latest reading, else the latest kit result.
    const meanFrom = new Date(refAt.getTime() - rule.temperatureMeanHours * HOUR);
    const [tMean, tLatest] = await Promise.all([
      this.repo.meanReading(probeIds, 'water_temperature', meanFrom, refAt),
      this.repo.latestReading(probeIds, 'water_temperature', new Date(refAt.getTime() - 7 * DAY), refAt),
    ]);
    let temperature: TemperatureBasis;
    if (tMean) {
      temperature = { temperatureC: tMean.mean, basis: 'probe_mean', text: `${rule.temperatureMeanHours}-h probe mean`, readings: tMean.n, from: tMean.first.toISOString(), to: tMean.last.toISOString() };
    } else if (tLatest) {
      temperature = { temperatureC: tLatest.value, basis: 'probe_latest', text: `latest probe reading, ${localDay(tLatest.at, tz)} ${local(tLatest.at)}`, readings: 1, from: tLatest.at.toISOString(), to: tLatest.at.toISOString() };
    } else if (latestResult?.temperatureC != null && refAt.getTime() - latestResult.sampledAt.getTime() <= 3 * DAY) {
      temperature = { temperatureC: latestResult.temperatureC, basis: 'kit_result', text: `with the kit result of ${localDay(latestResult.sampledAt, tz)} ${local(latestResult.sampledAt)}`, readings: 1, from: latestResult.sampledAt.toISOString(), to: latestResult.sampledAt.toISOString() };
    } else {
      temperature = { temperatureC: null, basis: 'none', text: 'no temperature', readings: 0, from: null, to: null };
    }

    const plan = planRation(
      {
        day,
        species,
        table: table ? { name: table.name, source: table.source, rows: table.rows as FeedTableRow[], maxKgPerHaPerDay: table.maxKgPerHaPerDay } : null,
        temperatureC: temperature.temperatureC,
        temperatureBasis: temperature.text,
        biomassKg: biomass.biomassKg,
        meanWeightG: biomass.meanWeightG,
        meanLengthCm: biomass.meanLengthCm,
        areaM2: unit.areaM2,
      },
      rule,
    );
    const planDto: RationPlanDto = {
      status: plan.status,
      text: plan.text,
      steps: plan.steps,
      method: plan.method,
      tableId: table?.id ?? null,
      tableName: table?.name ?? null,
      tableSource: table?.source ?? null,
      rowIndex: plan.rowIndex,
      row: plan.row ? { ...plan.row, note: plan.row.note ?? undefined } : null,
      tablePctBw: round(plan.tablePctBw, 4),
      temperatureFactor: round(plan.temperatureFactor, 4),
      pctBodyWeightPerDay: round(plan.pctBodyWeightPerDay, 4) ?? 0,
      uncappedKg: round(plan.uncappedKg, 2) ?? 0,
      capKg: round(plan.capKg, 2),
      capApplied: plan.capApplied,
      plannedKg: plan.plannedKg,
      daysPerWeek: plan.daysPerWeek,
      feedingDay: plan.feedingDay,
      nextFeedingDay: plan.nextFeedingDay,
      temperature: { ...temperature, temperatureC: round(temperature.temperatureC, 2) },
    };

    // Dissolved oxygen: the latest reading and the lowest around today's dawn.
    const [dawnH, dawnM] = settings.dawnLocalTime.split(':').map(Number) as [number, number];
    const dawn = zonedTime(day, dawnH, dawnM, tz);
    const dawnFrom = new Date(dawn.getTime() - rule.dawnWindowHours * HOUR);
    const dawnTo = new Date(Math.min(dawn.getTime() + rule.dawnWindowHours * HOUR, refAt.getTime()));
    const [doLatest, doDawn, alerts] = await Promise.all([
      this.repo.latestReading(probeIds, 'dissolved_oxygen', new Date(refAt.getTime() - rule.doMaxAgeHours * HOUR), refAt),
      dawnFrom <= dawnTo ? this.repo.lowestReading(probeIds, 'dissolved_oxygen', dawnFrom, dawnTo) : Promise.resolve(null),
      day === today ? this.openDoAlerts(farmId, unitId, rule.doAlertKinds) : Promise.resolve([]),
    ]);
    const profileRules = (profile?.rules ?? []) as ProfileRule[];
    const doRule = profileRules.find((r) => r.metric === 'do_min');
    const criticalMgL = rule.criticalDoMgL[species] ?? doRule?.act ?? null;

    // Free ammonia against the profile's levels.
    const salinityPpt = latestResult?.salinityPpt ?? unit.defaultSalinityPpt;
    const levels = nh3Levels(profileRules, salinityPpt);
    const forecastPeak = latestResult?.forecastPeak as { nh3MgL?: number; at?: string; localTime?: string } | null | undefined;
    const recentNh3 = okResults
      .slice(0, rule.ammonia.trendResults)
      .map((r) => r.nh3MgL as number)
      .reverse();

    // Treatment: the one that ended most recently within the cut window.
    const recentTreatments = await this.treatments.recent(farmId, unitId, 7 * DAY, refAt);
    const treated = recentTreatments
      .map((t) => ({ t, end: t.endsAt && t.endsAt < refAt ? t.endsAt : t.endsAt ? refAt : t.startsAt }))
      .sort((a, b) => b.end.getTime() - a.end.getTime())[0];
    const treatmentHours = treated ? (refAt.getTime() - treated.end.getTime()) / HOUR : null;

    // Observations: a die-off sign today, and other signs in the last 24 h.
    const dayStart = zonedTime(day, 0, 0, tz);
    const obs = await this.observations.list(farmId, unitId);
    const dieOffObs = obs.find((o) => rule.dieOffKinds.includes(o.kind) && o.observedAt >= dayStart && o.observedAt <= refAt) ?? null;
    const noteObs = obs.filter((o) => rule.noteKinds.includes(o.kind) && o.observedAt > new Date(refAt.getTime() - DAY) && o.observedAt <= refAt);

    // Flow, pH and temperature at the outlet for the ammonia load.
    const isRaceway = unit.kind === 'raceway';
    const hasFlow = unit.kind === 'raceway' || unit.kind === 'tank';
    const recent = new Date(refAt.getTime() - rule.raceway.flowReadingMaxAgeHours * HOUR);
    const [flowNow, phLatest, tempLatest] = await Promise.all([
      hasFlow ? this.flowAt(unitId, probeIds, refAt, refAt.getTime() === now.getTime(), recent) : Promise.resolve(null),
      this.repo.latestReading(probeIds, 'ph', recent, refAt),
      this.repo.latestReading(probeIds, 'water_temperature', recent, refAt),
    ]);
    const designFlowLpm = flowNow?.designFlowLpm ?? null;
    const flow = flowNow?.flow ?? null;
    const flowDto = flow
      ? {
          flowLpm: round(flow.flowLpm, 1),
          source: flow.source,
          at: flow.at?.toISOString() ?? null,
          designFlowLpm,
          pctOfDesign: flow.flowLpm !== null && designFlowLpm ? round((flow.flowLpm / designFlowLpm) * 100, 1) : null,
          reduced: flow.flowLpm !== null && designFlowLpm !== null && flow.flowLpm < rule.raceway.reducedFlowFraction * designFlowLpm,
        }
      : null;
    const outletPh = phLatest?.value ?? latestResult?.ph ?? null;
    const outletT = tempLatest?.value ?? temperature.temperatureC ?? latestResult?.temperatureC ?? null;
    const method = settings.freeAmmoniaMethod === 'auto' ? undefined : (settings.freeAmmoniaMethod as AmmoniaMethod);
    const ammoniaLoad = this.ammoniaLoad({
      unit,
      isRaceway,
      plannedKg: plan.plannedKg,
      flow: flowDto,
      inletTanMgL: rule.raceway.inletTanMgL,
      pH: outletPh,
      temperatureC: outletT,
      salinityPpt,
      targetNh3MgL: levels?.actNh3MgL ?? null,
      targetSource: levels ? `act level of “${profile?.name ?? 'threshold profile'}” (${levels.basis}; ${levels.source})` : null,
      method,
    });
    const loading = this.loading(unit, rule, biomass, flow?.flowLpm ?? null, designFlowLpm);

    const signals: FeedSignals = {
      species,
      plannedKg: plan.plannedKg,
      plan: { status: plan.status, text: plan.text },
      oxygen: {
        criticalMgL,
        latest: doLatest ? { mgL: doLatest.value, localTime: local(doLatest.at) } : null,
        dawnLow: doDawn ? { mgL: doDawn.value, localTime: local(doDawn.at) } : null,
        openAlerts: alerts.map((a) => ({ kind: a.kind, level: a.level, title: a.title })),
      },
      ammonia: {
        watchNh3MgL: levels?.watchNh3MgL ?? null,
        actNh3MgL: levels?.actNh3MgL ?? null,
        latest: latestResult
          ? {
              nh3MgL: latestResult.nh3MgL as number,
              localTime: local(latestResult.sampledAt),
              day: localDay(latestResult.sampledAt, tz),
              ageHours: (refAt.getTime() - latestResult.sampledAt.getTime()) / HOUR,
              flags: (latestResult.flags ?? []).map((f) => f.message),
            }
          : null,
        forecast:
          forecastPeak && typeof forecastPeak.nh3MgL === 'number' && forecastPeak.at
            ? { nh3MgL: forecastPeak.nh3MgL, localTime: forecastPeak.localTime ?? local(new Date(forecastPeak.at)), day: localDay(new Date(forecastPeak.at), tz) }
            : null,
        recentNh3MgL: recentNh3,
      },
      treatment:
        treated && treatmentHours !== null && treatmentHours <= rule.treatment.cutWithinHours
          ? { label: `${treated.t.productName ?? treated.t.product.replace('_', ' ')} treatment ${treated.t.endsAt && treated.t.endsAt > refAt ? 'under way, started' : 'ended'}`, hoursSinceEnd: treatmentHours }
          : null,
      dieOff: dieOffObs ? { kind: dieOffObs.kind, localTime: local(dieOffObs.observedAt), count: dieOffObs.count } : null,
      notes: noteObs.map((o) => ({ kind: o.kind, localTime: `${localDay(o.observedAt, tz) === day ? '' : `${localDay(o.observedAt, tz)} `}${local(o.observedAt)}`, detail: o.detail })),
      raceway: isRaceway
        ? {
            flowLpm: flow?.flowLpm ?? null,
            flowSource: flow ? (flow.source === 'probe' ? `probe at ${flow.at ? local(flow.at) : '?'}` : flow.source === 'none' ? null : `${flow.source} of ${flow.at ? localDay(flow.at, tz) : '?'}`) : null,
            designFlowLpm,
            plannedNh3MgL: ammoniaLoad.plannedNh3MgL,
            plannedTanRiseMgL: ammoniaLoad.plannedTanRiseMgL,
            targetNh3MgL: ammoniaLoad.targetNh3MgL,
            maxFeedKg: ammoniaLoad.maxFeedKgPerDay,
            pH: outletPh,
            temperatureC: outletT,
          }
        : null,
    };
    const decision = decideFeed(signals, rule);
    ammoniaLoad.recommendedKg = decision.recommendedKg;
    ammoniaLoad.recommendedTanKgPerDay = round(tanProductionKgPerDay({ feedKgPerDay: decision.recommendedKg, proteinFraction: unit.feedProteinFraction }), 4);

    const inputs: Record<string, unknown> = {
      day,
      today,
      refAt: refAt.toISOString(),
      ruleVersion: FEED_RULE_VERSION,
      rule,
      unit: { code: unit.code, kind: unit.kind, species: unit.species, state: unit.state, areaM2: unit.areaM2, volumeM3: unit.volumeM3, feedProteinFraction: unit.feedProteinFraction, salinityPpt: unit.defaultSalinityPpt },
      biomass: presentEstimate(biomass),
      plan: planDto,
      oxygen: {
        criticalMgL,
        criticalSource: rule.criticalDoMgL[species] !== undefined ? feedRuleSources.do : (doRule?.source ?? null),
        latest: doLatest ? { mgL: doLatest.value, at: doLatest.at.toISOString() } : null,
        dawnWindow: { from: dawnFrom.toISOString(), to: dawnTo.toISOString() },
        dawnLow: doDawn ? { mgL: doDawn.value, at: doDawn.at.toISOString() } : null,
        openAlerts: alerts.map((a) => ({ id: a.id, kind: a.kind, level: a.level, title: a.title, openedAt: a.openedAt })),
      },
      ammonia: {
        levels,
        profileId: profile?.id ?? null,
        latest: latestResult
          ? { resultId: latestResult.id, waterTestId: latestResult.waterTestId, sampledAt: latestResult.sampledAt.toISOString(), tanMgL: latestResult.tanMgL, nh3MgL: latestResult.nh3MgL, nh3NMgL: latestResult.nh3NMgL, pH: latestResult.ph, temperatureC: latestResult.temperatureC, salinityPpt: latestResult.salinityPpt, flags: latestResult.flags }
          : null,
        forecastPeak: forecastPeak ?? null,
        recent: okResults.slice(0, rule.ammonia.trendResults).map((r) => ({ resultId: r.id, sampledAt: r.sampledAt.toISOString(), nh3MgL: r.nh3MgL })),
      },
      treatment: treated && treatmentHours !== null && treatmentHours <= rule.treatment.cutWithinHours
        ? { id: treated.t.id, product: treated.t.product, productName: treated.t.productName, startsAt: treated.t.startsAt.toISOString(), endsAt: treated.t.endsAt?.toISOString() ?? null, hoursSinceEnd: round(treatmentHours, 1) }
        : null,
      observations: {
        dieOff: dieOffObs ? { id: dieOffObs.id, kind: dieOffObs.kind, observedAt: dieOffObs.observedAt.toISOString(), count: dieOffObs.count, detail: dieOffObs.detail } : null,
        notes: noteObs.map((o) => ({ id: o.id, kind: o.kind, observedAt: o.observedAt.toISOString(), detail: o.detail })),
      },
      flow: flowDto,
      ammoniaLoad,
      loading,
    };
    return { day, today, refAt, farm, unit, rule, biomass, table, plan, planDto, loading, ammoniaLoad, signals, decision, inputs };
  }

  /**
   * The unit's flow: now, the units module's current flow (newest probe reading or measurement); for a
   * past day, the probe reading of its last hours or else the latest measurement before its end.
   */
  private async flowAt(unitId: string, probeIds: string[], refAt: Date, isNow: boolean, recent: Date) {
    type Flow = { flowLpm: number | null; source: 'probe' | 'measurement' | 'design' | 'none'; at: Date | null };
    const none: Flow = { flowLpm: null, source: 'none', at: null };
    if (isNow) {
      const [latest, designFlowLpm] = await Promise.all([this.units.latestFlowLpm(unitId), this.units.designFlowLpm(unitId)]);
      const flow: Flow = latest ? { flowLpm: latest.flowLpm, source: latest.source === 'manual' ? 'measurement' : latest.source, at: latest.at } : none;
      return { flow, designFlowLpm };
    }
    const [probe, measured, design] = await Promise.all([
      this.repo.latestReading(probeIds, 'flow', recent, refAt),
      this.repo.latestFlowMeasurement(unitId, refAt),
      this.repo.latestFlowMeasurement(unitId, refAt, 'design'),
    ]);
    const flow: Flow = probe
      ? { flowLpm: probe.value, source: 'probe', at: probe.at }
      : measured
        ? { flowLpm: measured.flowLpm, source: measured.source === 'design' ? 'design' : 'measurement', at: measured.measuredAt }
        : none;
    return { flow, designFlowLpm: design?.flowLpm ?? null };
  }

  /** TAN from the ration; for a raceway the rise at the current flow, the outlet NH3, and the most feed under target. */
  private ammoniaLoad(a: {
    unit: CultureUnit;
    isRaceway: boolean;
    plannedKg: number;
    flow: { flowLpm: number | null; source: 'probe' | 'measurement' | 'design' | 'none'; at: string | null; designFlowLpm: number | null; pctOfDesign: number | null; reduced: boolean } | null;
    inletTanMgL: number;
    pH: number | null;
    temperatureC: number | null;
    salinityPpt: number;
    targetNh3MgL: number | null;
    targetSource: string | null;
    method: AmmoniaMethod | undefined;
  }): AmmoniaLoadDto {
    const protein = a.unit.feedProteinFraction;
    const plannedTan = tanProductionKgPerDay({ feedKgPerDay: a.plannedKg, proteinFraction: protein });
    const notes: string[] = [];
    const out: AmmoniaLoadDto = {
      proteinFraction: protein,
      plannedKg: a.plannedKg,
      plannedTanKgPerDay: round(plannedTan, 4) ?? 0,
      recommendedKg: null,
      recommendedTanKgPerDay: null,
      flow: a.flow,
      inletTanMgL: a.isRaceway ? a.inletTanMgL : null,
      plannedTanRiseMgL: null,
      pH: a.pH,
      temperatureC: round(a.temperatureC, 2),
      salinityPpt: a.salinityPpt,
      fraction: null,
      plannedNh3MgL: null,
      targetNh3MgL: a.targetNh3MgL,
      targetNh3NMgL: a.targetNh3MgL !== null ? round(a.targetNh3MgL / NH3_PER_NH3_N, 5) : null,
      targetSource: a.targetSource,
      maxFeedKgPerDay: null,
      check: a.isRaceway ? 'unknown' : 'not_raceway',
      notes,
      source: feedRuleSources.ammoniaLoad,
    };
    if (!a.isRaceway) return out;
    const flowLpm = a.flow?.flowLpm ?? null;
    if (flowLpm === null || flowLpm <= 0) notes.push('No flow known: the TAN rise cannot be worked out');
    if (a.pH === null || a.temperatureC === null) notes.push('No recent pH or temperature: the outlet NH3 cannot be worked out');
    if (a.targetNh3MgL === null) notes.push('The unit’s threshold profile has no NH3 act level: no target');
    if (flowLpm === null || flowLpm <= 0) return out;
    const rise = racewayTanRiseMgL({ tanProductionKgPerDay: plannedTan, flowLpm });
    out.plannedTanRiseMgL = round(rise, 4);
    if (a.pH === null || a.temperatureC === null) return out;
    try {
      const { fraction } = unionizedFraction({ pH: a.pH, temperatureC: a.temperatureC, salinityPpt: a.salinityPpt, ...(a.method ? { method: a.method } : {}) });
      out.fraction = round(fraction, 6);
      const nh3 = fraction * (a.inletTanMgL + rise) * NH3_PER_NH3_N;
      out.plannedNh3MgL = round(nh3, 5);
      if (a.targetNh3MgL !== null) {
        const maxFeed = maxFeedKgPerDay({
          targetNh3NMgL: a.targetNh3MgL / NH3_PER_NH3_N,
          inletTanMgL: a.inletTanMgL,
          flowLpm,
          proteinFraction: protein,
          pH: a.pH,
          temperatureC: a.temperatureC,
          salinityPpt: a.salinityPpt,
          ...(a.method ? { method: a.method } : {}),
        });
        out.maxFeedKgPerDay = round(maxFeed, 2);
        out.check = nh3 > a.targetNh3MgL ? 'over' : 'under';
      }
    } catch (err) {
      if (!(err instanceof ChemistryInputError)) throw err;
      notes.push(`The outlet NH3 could not be worked out: ${err.message}`);
    }
    return out;
  }

  /** Density for every unit; Piper et al. (1982) density and flow indices and capacity for raceways and tanks. */
  private loading(unit: CultureUnit, rule: FeedRule, biomass: UnitEstimate, flowLpm: number | null, designFlowLpm: number | null): LoadingDto {
    const w = biomass.biomassKg;
    const v = unit.volumeM3;
    const L = biomass.meanLengthCm;
    const notes: string[] = [];
    const cap = unit.species ? (rule.loading.densityCapKgPerM3[unit.species] ?? null) : null;
    const out: LoadingDto = {
      biomassKg: round(w, 2),
      volumeM3: v,
      densityKgPerM3: w !== null && v ? round(w / v, 3) : null,
      densityCapKgPerM3: cap,
      lengthCm: round(L, 2),
      flowLpm: round(flowLpm, 1),
      densityIndex: null,
      densityIndexMax: rule.loading.densityIndexMax,
      flowIndex: null,
      flowIndexMax: rule.loading.flowIndexMax,
      capacityKg: null,
      capacityByDensityKg: null,
      capacityByFlowKg: null,
      governedBy: null,
      designCapacityKg: null,
      overCapacity: null,
      exchangesPerHour: flowLpm && v ? round((flowLpm * 60) / 1000 / v, 2) : null,
      minExchangesPerHour: rule.loading.minExchangesPerHour,
      notes,
      source: feedRuleSources.loading,
    };
    if (cap !== null && out.densityKgPerM3 !== null && out.densityKgPerM3 > cap) notes.push(`Density ${out.densityKgPerM3} kg/m³ is over the ${cap} kg/m³ cap`);
    if (unit.kind !== 'raceway' && unit.kind !== 'tank') return out;
    if (out.exchangesPerHour !== null && out.exchangesPerHour < rule.loading.minExchangesPerHour) {
      notes.push(`${out.exchangesPerHour} water exchanges per hour, under the ${rule.loading.minExchangesPerHour} per hour minimum`);
    }
    if (w === null || !v || L === null || L <= 0) {
      notes.push('Density and flow indices need the biomass, volume and mean length');
      return out;
    }
    out.densityIndex = round(densityIndex({ weightKg: w, volumeM3: v, fishLengthCm: L }), 4);
    if (!flowLpm || flowLpm <= 0) {
      notes.push('No flow known: flow index and capacity cannot be worked out');
      return out;
    }
    out.flowIndex = round(flowIndex({ weightKg: w, inflowLpm: flowLpm, fishLengthCm: L }), 5);
    const capNow = racewayCapacityKg({ volumeM3: v, inflowLpm: flowLpm, fishLengthCm: L, densityIndexMax: rule.loading.densityIndexMax, flowIndexMax: rule.loading.flowIndexMax });
    out.capacityKg = round(capNow.capacityKg, 1);
    out.capacityByDensityKg = round(capNow.byDensityKg, 1);
    out.capacityByFlowKg = round(capNow.byFlowKg, 1);
    out.governedBy = capNow.governedBy;
    out.overCapacity = w > capNow.capacityKg;
    if (designFlowLpm && designFlowLpm > 0) {
      out.designCapacityKg = round(racewayCapacityKg({ volumeM3: v, inflowLpm: designFlowLpm, fishLengthCm: L, densityIndexMax: rule.loading.densityIndexMax, flowIndexMax: rule.loading.flowIndexMax }).capacityKg, 1);
    }
    if (out.overCapacity) notes.push(`Biomass ${round(w, 0)} kg is over the ${out.capacityKg} kg capacity at the current flow (governed by ${capNow.governedBy})`);
    return out;
  }

  /**
   * Computes and stores the recommendation of one unit for a day (idempotent per unit and day). Once the
   * planner has accepted or overridden it, the decision stays; a different new proposal is kept beside it.
   * Returns null for a unit without fish.
   */
  async recommend(farmId: string, unitId: string, day?: string, now = new Date()): Promise<FeedRecommendation | null> {
    const p = await this.planUnit(farmId, unitId, day, now);
    if (!p.biomass.stocked) return null;
    const proposal: ProposalRow = {
      biomassKg: round(p.biomass.biomassKg ?? 0, 2) ?? 0,
      plannedKg: p.plan.plannedKg,
      plannedPctBw: round(p.plan.pctBodyWeightPerDay, 4) ?? 0,
      action: p.decision.action,
      cutPct: p.decision.cutPct,
      recommendedKg: p.decision.recommendedKg,
      reasons: p.decision.reasons,
      inputs: p.inputs,
      ruleVersion: FEED_RULE_VERSION,
      computedAt: now,
    };
    const { row, outcome } = await this.repo.upsertProposal({ farmId, unitId, day: p.day }, proposal, (existing) => {
      const decided = latestProposalOf(existing);
      if (decided.action === proposal.action && decided.recommendedKg === proposal.recommendedKg && decided.plannedKg === proposal.plannedKg) return null;
      const later: LaterProposal = {
        computedAt: now.toISOString(),
        action: proposal.action,
        cutPct: proposal.cutPct,
        plannedKg: proposal.plannedKg,
        plannedPctBw: proposal.plannedPctBw,
        biomassKg: proposal.biomassKg,
        recommendedKg: proposal.recommendedKg,
        reasons: proposal.reasons as FeedReason[],
        ruleVersion: proposal.ruleVersion,
        inputs: proposal.inputs,
      };
      return later as unknown as Record<string, unknown>;
    });
    this.live.notify({ type: 'recommendation', farmId, unitId, data: { recommendationId: row.id, day: row.day, action: row.action, status: row.status, outcome } });
    return row;
  }

  /** Recommendations for every stocked unit of the farm for a day; a unit that fails does not stop the others. */
  async recommendFarm(farmId: string, day?: string, now = new Date()): Promise<{ day: string; computed: FeedRecommendation[]; failed: Array<{ unitId: string; message: string }> }> {
    const farm = await this.farmOrThrow(farmId);
    const { day: d, refAt } = this.dayOf(farm, day, now);
    const units = await this.stock.stockedUnits(farmId, refAt);
    return this.recommendUnits(farmId, units, d, now);
  }

  /** Stocked units of the farm with no recommendation for the day yet get one (the first result of a day fills the sheet). */
  async fillMissing(farmId: string, day?: string, now = new Date()): Promise<{ day: string; computed: FeedRecommendation[]; failed: Array<{ unitId: string; message: string }> }> {
    const farm = await this.farmOrThrow(farmId);
    const { day: d, refAt } = this.dayOf(farm, day, now);
    const have = new Set((await this.repo.recommendationsOfDay(farmId, d)).map((r) => r.unitId));
    const units = (await this.stock.stockedUnits(farmId, refAt)).filter((u) => !have.has(u.id));
    return this.recommendUnits(farmId, units, d, now);
  }

  private async recommendUnits(farmId: string, units: CultureUnit[], day: string, now: Date) {
    const computed: FeedRecommendation[] = [];
    const failed: Array<{ unitId: string; message: string }> = [];
    for (const unit of units) {
      try {
        const r = await this.recommend(farmId, unit.id, day, now);
        if (r) computed.push(r);
      } catch (err) {
        this.logger.warn({ err, farmId, unitId: unit.id, day }, 'feed recommendation failed');
        failed.push({ unitId: unit.id, message: err instanceof Error ? err.message : String(err) });
      }
    }
    return { day, computed, failed };
  }

  /** The stored recommendation of a unit for a day, if any. */
  storedFor(unitId: string, day: string): Promise<FeedRecommendation | null> {
    return this.repo.recommendationOf(unitId, day);
  }

  async getRecommendation(farmId: string, id: string): Promise<FeedRecommendation> {
    const rec = await this.repo.findRecommendation(farmId, id);
    if (!rec) throw notFound('Recommendation');
    return rec;
  }

  /**
   * Accepts the recommendation as proposed. When a newer proposal was computed after an earlier
   * decision, accepting takes the newer one (the one the planner sees now).
   */
  async accept(farmId: string, id: string, actorId: string | null, note?: string): Promise<FeedRecommendation> {
    const rec = await this.getRecommendation(farmId, id);
    const before = decisionSnapshot(rec);
    const later = laterProposalsOf(rec).at(-1);
    if (later && rec.status !== 'pending') {
      const { inputs, ...summary } = later;
      Object.assign(rec, {
        action: summary.action,
        cutPct: summary.cutPct,
        plannedKg: summary.plannedKg,
        plannedPctBw: summary.plannedPctBw,
        biomassKg: summary.biomassKg,
        recommendedKg: summary.recommendedKg,
        reasons: summary.reasons,
        ruleVersion: summary.ruleVersion,
        computedAt: new Date(summary.computedAt),
        inputs: { ...inputs, replacedProposal: { ...decisionSnapshot(rec), reasons: rec.reasons } },
      });
    }
    rec.status = 'accepted';
    rec.approvedKg = rec.recommendedKg;
    rec.overrideNote = note?.trim() || null;
    rec.decidedById = actorId;
    rec.decidedAt = new Date();
    const saved = await this.repo.saveRecommendation(rec);
    await this.audit.record({ farmId, actorId, action: 'feed_recommendation.accepted', entity: 'feed_recommendation', entityId: rec.id, before, after: decisionSnapshot(saved) });
    this.live.notify({ type: 'recommendation', farmId, unitId: rec.unitId, data: { recommendationId: rec.id, day: rec.day, status: rec.status } });
    return saved;
  }

  /** Sets another ration with the planner's reason (required), audited with before and after. */
  async override(farmId: string, id: string, input: OverrideRecommendation, actorId: string | null): Promise<FeedRecommendation> {
    const rec = await this.getRecommendation(farmId, id);
    const before = decisionSnapshot(rec);
    rec.status = 'overridden';
    rec.approvedKg = roundKg(input.approvedKg);
    rec.overrideNote = input.note.trim();
    rec.decidedById = actorId;
    rec.decidedAt = new Date();
    const saved = await this.repo.saveRecommendation(rec);
    await this.audit.record({ farmId, actorId, action: 'feed_recommendation.overridden', entity: 'feed_recommendation', entityId: rec.id, before, after: decisionSnapshot(saved) });
    this.live.notify({ type: 'recommendation', farmId, unitId: rec.unitId, data: { recommendationId: rec.id, day: rec.day, status: rec.status } });
    return saved;
  }

  /** Accepts every pending recommendation of a day (or of the listed units); decided ones are left as they are. */
  async acceptDay(farmId: string, day: string, unitIds: string[] | undefined, actorId: string | null) {
    await this.farmOrThrow(farmId);
    const wanted = unitIds ? new Set(unitIds) : null;
    const recs = (await this.repo.recommendationsOfDay(farmId, day)).filter((r) => !wanted || wanted.has(r.unitId));
    const accepted: FeedRecommendation[] = [];
    const skipped: FeedRecommendation[] = [];
    for (const r of recs) {
      if (r.status === 'pending') accepted.push(await this.accept(farmId, r.id, actorId));
      else skipped.push(r);
    }
    return { day, accepted, skipped };
  }

  /** The ration sheet of a day: per unit the planned, recommended and approved kg, status, reasons, and what was fed. */
  async rationSheet(farmId: string, dayIn?: string, now = new Date()) {
    const farm = await this.farmOrThrow(farmId);
    const { day, today, refAt } = this.dayOf(farm, dayIn, now);
    const [units, recs, feedings, stocked] = await Promise.all([
      this.repo.unitsOfFarm(farmId),
      this.repo.recommendationsOfDay(farmId, day),
      this.feedings.forDay(farmId, day),
      this.stock.stockedUnits(farmId, refAt),
    ]);
    const recOf = new Map(recs.map((r) => [r.unitId, r]));
    const fedOf = new Map<string, FeedingRecord>();
    for (const f of feedings) fedOf.set(f.unitId, f);
    const stockedIds = new Set(stocked.map((u) => u.id));
    const rows = units
      .filter((u) => stockedIds.has(u.id) || recOf.has(u.id) || fedOf.has(u.id))
      .map((unit) => ({ unit, recommendation: recOf.get(unit.id) ?? null, feeding: fedOf.get(unit.id) ?? null }));
    return { farm, day, today, rows };
  }
}

/** The proposal a decided recommendation currently stands on: its own, or the last one kept beside it. */
function latestProposalOf(rec: FeedRecommendation): { action: string; recommendedKg: number; plannedKg: number } {
  const later = laterProposalsOf(rec).at(-1);
  return later ?? { action: rec.action, recommendedKg: rec.recommendedKg, plannedKg: rec.plannedKg };
}

export function laterProposalsOf(rec: FeedRecommendation): LaterProposal[] {
  const list = rec.inputs?.laterProposals;
  return Array.isArray(list) ? (list as LaterProposal[]) : [];
}

function decisionSnapshot(r: FeedRecommendation): Record<string, unknown> {
  return {
    day: r.day,
    unitId: r.unitId,
    status: r.status,
    action: r.action,
    plannedKg: r.plannedKg,
    recommendedKg: r.recommendedKg,
    cutPct: r.cutPct,
    approvedKg: r.approvedKg,
    overrideNote: r.overrideNote,
    decidedById: r.decidedById,
    decidedAt: r.decidedAt?.toISOString() ?? null,
    ruleVersion: r.ruleVersion,
  };
}
