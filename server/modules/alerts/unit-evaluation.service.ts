import { THRESHOLD_CAUTION } from '../../../shared/schemas/thresholds.schema';
import type { AlertSummaryResponse, UnitEvaluationDto } from '../../../shared/schemas/alerts.schema';
import type { UnitStatusLevel } from '../../../shared/schemas/farms.schema';
import type { ProbeDto } from '../../../shared/schemas/probes.schema';
import type { UnitDto } from '../../../shared/schemas/units.schema';
import type { Alert, ThresholdRule } from '../../db/entities';
import { notFound } from '../../http/errors';
import type { Logger } from '../../lib/logger';
import type { LiveService } from '../live/live.service';
import type { ProbesService } from '../probes/probes.service';
import type { ReadingsService } from '../readings/readings.service';
import type { TasksService } from '../tasks/tasks.service';
import type { ThresholdsService } from '../thresholds/thresholds.service';
import type { UnitsService } from '../units/units.service';
import {
  EVALUATION_RULES,
  evaluateUnitFacts,
  farmSilenceCheck,
  nightAround,
  unitStatusOf,
  type FarmContext,
  type Latest,
  type SpotQuantity,
  type UnitEvaluationResult,
  type UnitFacts,
} from './alert-rules';
import { presentCheck } from './alerts.presenter';
import type { AlertsService } from './alerts.service';
import type { FarmDirectory, FarmInfo } from './ports';
import type { UnitFactsRepository } from './unit-facts.repository';

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;

const SPOT_ANALYTES: Record<string, SpotQuantity> = {
  ph: 'ph',
  temperature: 'water_temperature',
  dissolved_oxygen: 'dissolved_oxygen',
  salinity: 'salinity',
};

export type EvaluationDeps = {
  facts: UnitFactsRepository;
  thresholds: Pick<ThresholdsService, 'byIds'>;
  alerts: AlertsService;
  farms: FarmDirectory;
  units: Pick<UnitsService, 'list' | 'get'>;
  probes: Pick<ProbesService, 'list'>;
  readings: Pick<ReadingsService, 'latestForFarm'>;
  tasks: Pick<TasksService, 'testsDue'>;
  live: Pick<LiveService, 'notify'>;
  logger: Logger;
};

type Gathered = { farm: FarmInfo; ctx: FarmContext; units: UnitDto[]; facts: Map<string, UnitFacts>; probes: ProbeDto[] };

/**
 * The unit evaluation: gathers a unit's (or a whole farm's) latest facts in a fixed number of queries,
 * runs the pure rules (alert-rules.ts) and applies the outcome to the alerts. The evaluate-unit job runs
 * one unit; the sweep-farms job every unit of a farm plus farm silence and re-alerts.
 */
export class UnitEvaluationService {
  constructor(private readonly d: EvaluationDeps) {}

  private async gather(farmId: string, now: Date, unitId?: string): Promise<Gathered> {
    const farm = await this.d.farms.farm(farmId);
    if (!farm) throw notFound('Farm');
    const units = unitId ? [await this.d.units.get(farmId, unitId)] : await this.d.units.list(farmId);
    const unitIds = units.map((u) => u.id);
    const night = nightAround(now, farm.timeZone, farm.settings.duskLocalTime, farm.settings.dawnLocalTime);
    const [probes, latestRows, schedule, results, nitrite, spots, profiles, farmSilent] = await Promise.all([
      this.d.probes.list(farmId, unitId ? { unitId } : {}),
      this.d.readings.latestForFarm(farmId),
      this.d.tasks.testsDue(farmId, now),
      this.d.facts.latestResults(farmId, unitIds),
      this.d.facts.latestTests(farmId, unitIds, ['nitrite'], null),
      this.d.facts.latestTests(farmId, unitIds, Object.keys(SPOT_ANALYTES), new Date(now.getTime() - EVALUATION_RULES.spotFreshHours * HOUR)),
      this.d.thresholds.byIds(units.map((u) => u.thresholdProfileId).filter((id): id is string => Boolean(id))),
      this.d.alerts.isFarmSilent(farmId),
    ]);
    const doProbeIds = probes.filter((p) => p.active && p.unitId && p.quantities.includes('dissolved_oxygen')).map((p) => p.id);
    const equipmentProbeIds = probes.filter((p) => p.active && (p.quantities.includes('aerator_running') || p.quantities.includes('pump_running'))).map((p) => p.id);
    const pondUnitIds = new Set(units.filter((u) => u.kind === 'pond').map((u) => u.id));
    const pondDoProbeIds = probes.filter((p) => doProbeIds.includes(p.id) && p.unitId && pondUnitIds.has(p.unitId)).map((p) => p.id);
    const [doHourAgo, ran, buckets, spotDo] = await Promise.all([
      this.d.facts.doBetween(doProbeIds, new Date(now.getTime() - 90 * MINUTE), new Date(now.getTime() - 60 * MINUTE)),
      this.d.facts.ranSince(equipmentProbeIds, new Date(now.getTime() - EVALUATION_RULES.recentRunHours * HOUR)),
      night.isNight ? this.d.facts.doBuckets(pondDoProbeIds, night.duskAt, now, EVALUATION_RULES.projectionBucketMinutes) : Promise.resolve([]),
      night.isNight ? this.d.facts.spotDoSince(farmId, [...pondUnitIds], night.duskAt, now) : Promise.resolve([]),
    ]);

    const profileById = new Map(profiles.map((p) => [p.id, p]));
    const scheduleByUnit = new Map(schedule.tests.map((t) => [t.unitId, t]));
    const facts = new Map<string, UnitFacts>();
    for (const u of units) {
      const mine = probes.filter((p) => p.unitId === u.id);
      const mineIds = new Set(mine.map((p) => p.id));
      const latest: Partial<Record<string, Latest>> = {};
      for (const r of latestRows) {
        if (!mineIds.has(r.probeId) || r.quality !== 'good') continue;
        const cur = latest[r.quantity];
        if (!cur || cur.at.getTime() < r.at.getTime()) latest[r.quantity] = { value: Number(r.value), at: new Date(r.at), probeId: r.probeId };
      }
      const spot: UnitFacts['spot'] = {};
      for (const t of spots.filter((s) => s.unitId === u.id)) {
        const q = SPOT_ANALYTES[t.analyte];
        if (q) spot[q] = { value: t.value, at: t.sampledAt, testId: t.id };
      }
      const doLatest = latest.dissolved_oxygen;
      const ago = doLatest ? doHourAgo.get(doLatest.probeId) : undefined;
      const probeBuckets = new Map<string, Array<{ at: Date; doMgL: number }>>();
      for (const b of buckets) if (mineIds.has(b.probeId)) probeBuckets.set(b.probeId, [...(probeBuckets.get(b.probeId) ?? []), { at: b.at, doMgL: b.doMgL }]);
      const bestProbe = [...probeBuckets.values()].sort((a, b) => b.length - a.length)[0];
      const spotPoints = spotDo.filter((t) => t.unitId === u.id).map((t) => ({ at: t.sampledAt, doMgL: t.value }));
      const nightDo: UnitFacts['nightDo'] =
        bestProbe && bestProbe.length >= 2 ? { basedOn: 'probe', points: bestProbe } : spotPoints.length >= 2 ? { basedOn: 'spot_test', points: spotPoints } : null;
      const profile = u.thresholdProfileId ? profileById.get(u.thresholdProfileId) : undefined;
      const okResult = results.ok.get(u.id);
      const anyResult = results.any.get(u.id);
      const no2 = nitrite.find((t) => t.unitId === u.id);
      const due = scheduleByUnit.get(u.id);
      facts.set(u.id, {
        unit: {
          id: u.id,
          code: u.code,
          name: u.name,
          kind: u.kind,
          state: u.state,
          waterType: u.waterType,
          species: u.species,
          defaultSalinityPpt: u.defaultSalinityPpt,
          testFrequencyDays: u.testFrequencyDays,
          closeWatchUntil: u.closeWatchUntil ? new Date(u.closeWatchUntil) : null,
          createdAt: new Date(u.createdAt),
        },
        profile: profile ? { id: profile.id, name: profile.name, species: profile.species, rules: profile.rules as ThresholdRule[] } : null,
        latestOkResult: okResult
          ? { id: okResult.id, waterTestId: okResult.waterTestId, sampledAt: okResult.sampledAt, tanMgL: okResult.tanMgL, nh3MgL: okResult.nh3MgL, nh3NMgL: okResult.nh3NMgL, ph: okResult.ph, temperatureC: okResult.temperatureC, salinityPpt: okResult.salinityPpt }
          : null,
        latestResultFlags: anyResult ? { id: anyResult.id, waterTestId: anyResult.waterTestId, sampledAt: anyResult.sampledAt, flags: anyResult.flags } : null,
        testDue: due
          ? { everyDays: due.everyDays, dueDay: due.dueDay, status: due.status, daysOverdue: due.daysOverdue, reason: due.reason, lastTestAt: due.lastTestAt ? new Date(due.lastTestAt) : null }
          : null,
        latestNitrite: no2 ? { id: no2.id, sampledAt: no2.sampledAt, value: no2.value, basis: no2.basis } : null,
        spot,
        probes: mine.map((p) => ({ id: p.id, label: p.label, active: p.active, intervalSeconds: p.intervalSeconds, quantities: p.quantities })),
        health: mine.map((p) => p.health),
        latest,
        doHourAgo: ago && doLatest ? { value: ago.value, at: ago.at, probeId: doLatest.probeId } : null,
        ranRecently: {
          aerator: ran.some((r) => mineIds.has(r.probeId) && r.quantity === 'aerator_running'),
          pump: ran.some((r) => mineIds.has(r.probeId) && r.quantity === 'pump_running'),
        },
        nightDo,
      });
    }
    const ctx: FarmContext = { farmId, timeZone: farm.timeZone, settings: farm.settings, now, night, farmSilent };
    return { farm, ctx, units, facts, probes };
  }

  private statusMap(units: UnitDto[], open: Alert[], probes: ProbeDto[]): Map<string, UnitStatusLevel> {
    const farmSilent = open.some((a) => a.kind === 'farm_silent');
    return new Map(
      units.map((u) => [
        u.id,
        unitStatusOf({
          fallow: u.state === 'fallow',
          activeProbeIds: probes.filter((p) => p.unitId === u.id && p.active).map((p) => p.id),
          farmSilent,
          alerts: open.filter((a) => a.unitId === u.id).map((a) => ({ kind: a.kind, level: a.level, probeId: a.probeId })),
        }),
      ]),
    );
  }

  private publishStatusChanges(farmId: string, before: Map<string, UnitStatusLevel>, after: Map<string, UnitStatusLevel>): void {
    for (const [unitId, status] of after) {
      const previous = before.get(unitId) ?? null;
      if (previous !== status) this.d.live.notify({ type: 'status', farmId, unitId, data: { status, previous } });
    }
  }

  /** The evaluation of one unit, without touching alerts (the unit screen shows it). */
  async evaluate(farmId: string, unitId: string, now = new Date()): Promise<UnitEvaluationDto> {
    const g = await this.gather(farmId, now, unitId);
    const f = g.facts.get(unitId);
    const unit = g.units[0];
    if (!f || !unit) throw notFound('Unit');
    const result = evaluateUnitFacts(f, g.ctx);
    const open = await this.d.alerts.openAlertsOf(farmId, { unitIds: [unitId] });
    const status = this.statusMap([unit], [...open, ...(g.ctx.farmSilent ? ([{ kind: 'farm_silent', level: 'act', unitId: null, probeId: null }] as Alert[]) : [])], g.probes).get(unitId) ?? 'clear';
    return this.present(g, unit, f, result, status, open);
  }

  private async present(g: Gathered, unit: UnitDto, f: UnitFacts, result: UnitEvaluationResult, status: UnitStatusLevel, open: Alert[]): Promise<UnitEvaluationDto> {
    return {
      farmId: g.farm.id,
      unitId: unit.id,
      unitCode: unit.code,
      unitName: unit.name,
      evaluatedAt: g.ctx.now.toISOString(),
      night: g.ctx.night.isNight,
      status,
      fallow: unit.state === 'fallow',
      profile: f.profile ? { id: f.profile.id, name: f.profile.name, species: f.profile.species } : null,
      checks: result.checks.map(presentCheck),
      dawnProjection: result.dawnProjection,
      reference: { epa2013: result.epa },
      openAlerts: await this.d.alerts.present(open),
      caution: THRESHOLD_CAUTION,
    };
  }

  /** The evaluate-unit job: evaluate one unit, open/update/resolve its alerts, publish a status change. */
  async evaluateAndApply(farmId: string, unitId: string, now = new Date()): Promise<{ status: UnitStatusLevel; opened: number; resolved: number }> {
    const g = await this.gather(farmId, now, unitId);
    const f = g.facts.get(unitId);
    const unit = g.units[0];
    if (!f || !unit) throw notFound('Unit');
    const farmLevel = g.ctx.farmSilent ? await this.d.alerts.openAlertsOf(farmId, { farmLevel: true }) : [];
    const before = await this.d.alerts.openAlertsOf(farmId, { unitIds: [unitId] });
    const result = evaluateUnitFacts(f, g.ctx);
    const outcome = await this.d.alerts.apply(farmId, { checks: result.checks, open: before, holdPrefixes: result.holdPrefixes, scopeNote: result.scopeNote, now });
    const after = await this.d.alerts.openAlertsOf(farmId, { unitIds: [unitId] });
    const statusBefore = this.statusMap([unit], [...before, ...farmLevel], g.probes);
    const statusAfter = this.statusMap([unit], [...after, ...farmLevel], g.probes);
    this.publishStatusChanges(farmId, statusBefore, statusAfter);
    return { status: statusAfter.get(unitId) ?? 'clear', opened: outcome.opened.length, resolved: outcome.resolved.length };
  }

  /**
   * The sweep of one farm (sweep-farms, every 60 s): farm silence first, then every unit (silence,
   * overdue tests, calibration, dawn projection and every other rule), then re-alerts. The same fixed
   * set of queries for the whole farm, and writes only where an alert changes.
   */
  async sweepFarm(farmId: string, now = new Date()): Promise<{ units: number; opened: number; resolved: number; realerted: number }> {
    const g = await this.gather(farmId, now);
    const openBefore = await this.d.alerts.openAlertsOf(farmId);
    const silence = farmSilenceCheck(
      g.probes.map((p) => p.health),
      g.ctx,
      g.farm.name,
    );
    const farmOutcome = await this.d.alerts.apply(farmId, {
      checks: [silence],
      open: openBefore.filter((a) => a.unitId === null),
      scopeNote: 'No longer evaluated.',
      now,
    });
    g.ctx.farmSilent = silence.verdict === 'raise';
    let opened = farmOutcome.opened.length;
    let resolved = farmOutcome.resolved.length;
    for (const u of g.units) {
      const f = g.facts.get(u.id);
      if (!f) continue;
      const result = evaluateUnitFacts(f, g.ctx);
      const outcome = await this.d.alerts.apply(farmId, {
        checks: result.checks,
        open: openBefore.filter((a) => a.unitId === u.id),
        holdPrefixes: result.holdPrefixes,
        scopeNote: result.scopeNote,
        now,
      });
      opened += outcome.opened.length;
      resolved += outcome.resolved.length;
    }
    const realerted = await this.d.alerts.realertDue(farmId, now);
    const openAfter = await this.d.alerts.openAlertsOf(farmId);
    this.publishStatusChanges(farmId, this.statusMap(g.units, openBefore, g.probes), this.statusMap(g.units, openAfter, g.probes));
    return { units: g.units.length, opened, resolved, realerted: realerted.length };
  }

  /** Open alert counts and map status per unit (badges, map colours). */
  async summary(farmId: string, now = new Date()): Promise<AlertSummaryResponse> {
    const units = await this.d.units.list(farmId);
    return this.d.alerts.summary(farmId, units, now);
  }

  /** Ids of every farm, for the sweep's fan-out. */
  async farmIds(): Promise<string[]> {
    return (await this.d.farms.allFarms()).map((f) => f.id);
  }
}
