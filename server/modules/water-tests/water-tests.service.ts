import { randomUUID } from 'node:crypto';
import {
  ChemistryInputError,
  forecastPeakNh3,
  freeAmmonia,
  type AmmoniaMethod,
  type AmmoniaReadingBasis,
} from '../../../shared/chemistry';
import { hhmm, localParts, zonedTime } from '../../../shared/farm-time';
import type { CreateWaterTest, UpdateWaterTest } from '../../../shared/schemas/water-tests.schema';
import { analyteRules } from '../../../shared/schemas/water-tests.schema';
import { defaultFarmSettings, type FarmSettings, type FreeAmmoniaResult, type WaterTest } from '../../db/entities';
import { badRequest, notFound } from '../../http/errors';
import type { Logger } from '../../lib/logger';
import type { Queues } from '../../queues';
import type { LiveService } from '../live/live.service';
import type { NearReading, WaterTestsRepository } from './water-tests.repository';

export type AuditSink = {
  record(e: { farmId: string | null; actorId: string | null; action: string; entity: string; entityId: string | null; before: Record<string, unknown> | null; after: Record<string, unknown> | null }): Promise<unknown>;
};

type ProvenanceValue = {
  quantity: 'ph' | 'water_temperature' | 'salinity';
  value: number;
  source: 'probe' | 'probe_interpolated' | 'handheld' | 'unit_default';
  probeId: string | null;
  probeLabel: string | null;
  readings: Array<{ at: string; value: number }>;
};

const HOUR = 3600_000;
const INTERFERING = new Set(['formalin', 'copper', 'ammonia_binder']);
const round = (v: number, d: number) => Math.round(v * 10 ** d) / 10 ** d;

/** Linear interpolation between the readings either side of `at` (or the one that exists). */
export function interpolate(before: NearReading | null, after: NearReading | null, at: Date): { value: number; interpolated: boolean } | null {
  if (before && after && after.at.getTime() !== before.at.getTime()) {
    const w = (at.getTime() - before.at.getTime()) / (after.at.getTime() - before.at.getTime());
    return { value: before.value + w * (after.value - before.value), interpolated: true };
  }
  const one = before ?? after;
  return one ? { value: one.value, interpolated: false } : null;
}

export class WaterTestsService {
  constructor(
    private readonly repo: WaterTestsRepository,
    private readonly queues: Queues,
    private readonly live: LiveService,
    private readonly audit: AuditSink,
    private readonly logger: Logger,
  ) {}

  private async unitOrThrow(farmId: string, unitId: string) {
    const unit = await this.repo.findUnit(farmId, unitId);
    if (!unit) throw notFound('Unit');
    return unit;
  }

  /** Stores a kit result once per client id and queues its computation. */
  async create(farmId: string, unitId: string, input: CreateWaterTest, userId: string | null): Promise<{ test: WaterTest; created: boolean }> {
    await this.unitOrThrow(farmId, unitId);
    const existing = await this.repo.findByClientId(farmId, input.clientId);
    if (existing) {
      if (existing.unitId !== unitId) throw badRequest('This client id was already used for another unit.', { fieldErrors: { clientId: ['already used'] } }, 'client_id_reused');
      return { test: existing, created: false };
    }
    const { test, created } = await this.repo.insertOnce({
      id: randomUUID(),
      farmId,
      unitId,
      clientId: input.clientId,
      analyte: input.analyte,
      method: input.method,
      basis: input.basis,
      value: input.value,
      unit: analyteRules[input.analyte].unit,
      sampledAt: input.sampledAt ? new Date(input.sampledAt) : new Date(),
      handheldPh: input.handheldPh ?? null,
      handheldTemperatureC: input.handheldTemperatureC ?? null,
      handheldSalinityPpt: input.handheldSalinityPpt ?? null,
      aeratorOn: input.aeratorOn ?? null,
      note: input.note ?? null,
      photoPath: null,
      source: input.source ?? 'pondside',
      enteredById: userId,
      version: 1,
    });
    if (created) await this.afterChange(test);
    return { test, created };
  }

  async update(farmId: string, unitId: string, testId: string, patch: UpdateWaterTest, userId: string): Promise<WaterTest> {
    const test = await this.repo.findTest(farmId, testId);
    if (!test || test.unitId !== unitId) throw notFound('Test');
    const before = snapshot(test);
    if (patch.method !== undefined) test.method = patch.method;
    if (patch.basis !== undefined) test.basis = patch.basis;
    if (patch.value !== undefined) test.value = patch.value;
    if (patch.sampledAt !== undefined) test.sampledAt = new Date(patch.sampledAt);
    if (patch.handheldPh !== undefined) test.handheldPh = patch.handheldPh ?? null;
    if (patch.handheldTemperatureC !== undefined) test.handheldTemperatureC = patch.handheldTemperatureC ?? null;
    if (patch.handheldSalinityPpt !== undefined) test.handheldSalinityPpt = patch.handheldSalinityPpt ?? null;
    if (patch.note !== undefined) test.note = patch.note ?? null;
    const rule = analyteRules[test.analyte as keyof typeof analyteRules];
    const problems: Record<string, string[]> = {};
    if (!(rule.bases as readonly string[]).includes(test.basis)) problems.basis = [`must be one of ${rule.bases.join(', ')}`];
    if (!(rule.methods as readonly string[]).includes(test.method)) problems.method = [`${test.method} is not a method for ${test.analyte}`];
    if (test.value < rule.min || test.value > rule.max) problems.value = [`must be between ${rule.min} and ${rule.max} ${rule.unit}`];
    if (Object.keys(problems).length) throw badRequest('Some fields are not valid.', { fieldErrors: problems }, 'validation_failed');
    test.version += 1;
    const saved = await this.repo.saveTest(test);
    await this.audit.record({ farmId, actorId: userId, action: 'water_test.edited', entity: 'water_test', entityId: test.id, before, after: { ...snapshot(saved), reason: patch.reason } });
    await this.afterChange(saved);
    return saved;
  }

  private async afterChange(test: WaterTest): Promise<void> {
    if (test.analyte === 'total_ammonia') {
      await this.queues.add(
        'computeWaterTest',
        { farmId: test.farmId, waterTestId: test.id, version: test.version },
        { jobId: `wt-${test.id}-${test.version}` },
      );
    } else {
      await this.queues.add('evaluateUnit', { farmId: test.farmId, unitId: test.unitId, reason: `test:${test.analyte}` }, { deduplication: { id: `unit:${test.unitId}`, keepLastIfActive: true } });
    }
    this.live.notify({ type: 'result', farmId: test.farmId, unitId: test.unitId, data: { testId: test.id, analyte: test.analyte, state: 'stored' } });
  }

  async get(farmId: string, testId: string): Promise<{ test: WaterTest; result: FreeAmmoniaResult | null }> {
    const test = await this.repo.findTest(farmId, testId);
    if (!test) throw notFound('Test');
    return { test, result: await this.repo.resultForTest(test.id) };
  }

  async list(farmId: string, unitId: string, q: { analyte?: string; from?: string; to?: string; limit: number }) {
    await this.unitOrThrow(farmId, unitId);
    const tests = await this.repo.listTests(unitId, {
      limit: q.limit,
      ...(q.analyte ? { analyte: q.analyte } : {}),
      ...(q.from ? { from: new Date(q.from) } : {}),
      ...(q.to ? { to: new Date(q.to) } : {}),
    });
    const results = new Map((await this.repo.resultsForTests(tests.map((t) => t.id))).map((r) => [r.waterTestId, r]));
    return tests.map((test) => ({ test, result: results.get(test.id) ?? null }));
  }

  async latestResult(farmId: string, unitId: string): Promise<FreeAmmoniaResult | null> {
    await this.unitOrThrow(farmId, unitId);
    return this.repo.latestResult(unitId);
  }

  /** Newest result per unit, for the farm map. */
  latestResultsOf(unitIds: string[]): Promise<FreeAmmoniaResult[]> {
    return this.repo.latestResultsOf(unitIds);
  }

  latestTestOf(unitId: string, analyte: string): Promise<WaterTest | null> {
    return this.repo.latestTestOf(unitId, analyte);
  }

  /**
   * The worker's job: merge a total-ammonia test with the nearest probe pH, temperature and salinity
   * (interpolated inside the window, bad or implausible readings skipped), fall back to handheld values
   * and the unit's default salinity, compute free ammonia, flag kit interference, forecast the day's peak.
   */
  async computeResult(waterTestId: string, version: number): Promise<FreeAmmoniaResult | null> {
    const test = await this.repo.findTestById(waterTestId);
    if (!test) return null;
    if (test.version !== version) {
      this.logger.debug({ waterTestId, version, current: test.version }, 'stale computation skipped');
      return null;
    }
    if (test.analyte !== 'total_ammonia') return null;
    const [unit, farm] = await Promise.all([this.repo.findUnit(test.farmId, test.unitId), this.repo.findFarm(test.farmId)]);
    if (!unit || !farm) return null;
    const settings: FarmSettings = { ...defaultFarmSettings, ...farm.settings };
    const windowMs = settings.probeWindowMinutes * 60_000;
    const probes = await this.repo.probesOfUnit(unit.id);
    const probeIds = probes.map((p) => p.id);
    const labels = new Map(probes.map((p) => [p.id, p.label]));

    const pick = async (quantity: ProvenanceValue['quantity'], handheld: number | null): Promise<ProvenanceValue | null> => {
      const { before, after } = await this.repo.readingsAround(probeIds, quantity, test.sampledAt, windowMs);
      const value = interpolate(before, after, test.sampledAt);
      if (value) {
        const used = [before, after].filter((r): r is NearReading => Boolean(r));
        const probeId = (before ?? after)?.probeId ?? null;
        return {
          quantity,
          value: round(value.value, 4),
          source: value.interpolated ? 'probe_interpolated' : 'probe',
          probeId,
          probeLabel: probeId ? (labels.get(probeId) ?? null) : null,
          readings: used.map((r) => ({ at: r.at.toISOString(), value: r.value })),
        };
      }
      if (handheld !== null) return { quantity, value: handheld, source: 'handheld', probeId: null, probeLabel: null, readings: [] };
      return null;
    };
    const [ph, temperature, salinityProbe] = await Promise.all([
      pick('ph', test.handheldPh),
      pick('water_temperature', test.handheldTemperatureC),
      pick('salinity', test.handheldSalinityPpt),
    ]);
    const salinity: ProvenanceValue = salinityProbe ?? {
      quantity: 'salinity',
      value: unit.defaultSalinityPpt,
      source: 'unit_default',
      probeId: null,
      probeLabel: null,
      readings: [],
    };
    const values = [ph, temperature, salinity].filter((v): v is ProvenanceValue => Boolean(v));
    const missing = [!ph ? 'ph' : null, !temperature ? 'water_temperature' : null].filter((m): m is string => Boolean(m));
    const provenance = { values, windowMinutes: settings.probeWindowMinutes, missing };
    const flags = await this.interferenceFlags(test, settings);
    const base = {
      waterTestId: test.id,
      farmId: test.farmId,
      unitId: test.unitId,
      sampledAt: test.sampledAt,
      testVersion: test.version,
      computedAt: new Date(),
      provenance,
      flags,
    };
    const empty = { tanMgL: null, nh3NMgL: null, nh3MgL: null, fraction: null, pKa: null, method: null, pHScale: null, forecastPeak: null };
    if (!ph || !temperature) {
      const stored = await this.repo.upsertResult({
        ...base,
        ...empty,
        status: !ph ? 'needs_ph' : 'needs_temperature',
        ph: ph?.value ?? null,
        temperatureC: temperature?.value ?? null,
        salinityPpt: salinity.value,
      });
      await this.afterResult(stored);
      return stored;
    }
    const method = settings.freeAmmoniaMethod === 'auto' ? undefined : (settings.freeAmmoniaMethod as AmmoniaMethod);
    let stored: FreeAmmoniaResult;
    try {
      const fa = freeAmmonia({
        readingMgL: test.value,
        basis: test.basis as AmmoniaReadingBasis,
        pH: ph.value,
        temperatureC: temperature.value,
        salinityPpt: salinity.value,
        ...(method ? { method } : {}),
      });
      const forecastPeak = await this.forecast(unit.id, probeIds, fa.tanMgL, salinity.value, method, test.sampledAt, farm.timeZone, fa.nh3MgL);
      stored = await this.repo.upsertResult({
        ...base,
        status: 'ok',
        tanMgL: fa.tanMgL,
        nh3NMgL: fa.nh3NMgL,
        nh3MgL: fa.nh3MgL,
        fraction: fa.fraction,
        pKa: round(ph.value - Math.log10(fa.fraction / (1 - fa.fraction)), 5),
        method: fa.method,
        pHScale: fa.pHScale,
        ph: ph.value,
        temperatureC: temperature.value,
        salinityPpt: salinity.value,
        forecastPeak,
      });
    } catch (err) {
      if (!(err instanceof ChemistryInputError)) throw err;
      stored = await this.repo.upsertResult({
        ...base,
        ...empty,
        status: 'invalid_input',
        flags: [...flags, { code: 'out_of_range', message: err.message }],
        ph: ph.value,
        temperatureC: temperature.value,
        salinityPpt: salinity.value,
      });
    }
    await this.afterResult(stored);
    return stored;
  }

  private async afterResult(result: FreeAmmoniaResult): Promise<void> {
    await this.queues.add('evaluateUnit', { farmId: result.farmId, unitId: result.unitId, reason: 'result' }, { deduplication: { id: `unit:${result.unitId}`, keepLastIfActive: true } });
    await this.queues.add('recommendFeed', { farmId: result.farmId, unitId: result.unitId }, { deduplication: { id: `feed:${result.unitId}`, keepLastIfActive: true } });
    this.live.notify({ type: 'result', farmId: result.farmId, unitId: result.unitId, data: { testId: result.waterTestId, status: result.status, nh3MgL: result.nh3MgL } });
  }

  /** Nessler kits read high after formalin, copper or ammonia binders; salicylate kits do not. */
  private async interferenceFlags(test: WaterTest, settings: FarmSettings): Promise<Array<{ code: string; message: string }>> {
    if (test.method !== 'nessler') return [];
    const from = new Date(test.sampledAt.getTime() - settings.nesslerInterferenceHours * HOUR);
    const treatments = (await this.repo.treatmentsBetween(test.unitId, from, test.sampledAt)).filter((t) => INTERFERING.has(t.product));
    return treatments.slice(0, 1).map((t) => {
      const hours = Math.round((test.sampledAt.getTime() - t.startsAt.getTime()) / HOUR);
      const product = t.product.replace('_', ' ');
      return {
        code: 'nessler_interference',
        message: `May read high — re-test with a salicylate kit. A ${product} treatment ${hours} h before this Nessler test can make Nessler results falsely high.`,
      };
    });
  }

  /**
   * Today's highest free ammonia from the latest TAN and the unit's diurnal pH/temperature curve: the mean
   * of each local hour over the last 72 h of probe readings, laid on the test's local day.
   */
  private async forecast(
    _unitId: string,
    probeIds: string[],
    tanMgL: number,
    salinityPpt: number,
    method: AmmoniaMethod | undefined,
    sampledAt: Date,
    timeZone: string,
    measuredNh3MgL: number,
  ): Promise<FreeAmmoniaResult['forecastPeak']> {
    const to = new Date(Math.max(sampledAt.getTime(), Date.now()));
    const from = new Date(to.getTime() - 72 * HOUR);
    const rows = await this.repo.hourlyCurve(probeIds, from, to, timeZone);
    const byHour = new Map<number, { ph?: number; t?: number }>();
    for (const r of rows) {
      const e = byHour.get(r.hour) ?? {};
      if (r.quantity === 'ph') e.ph = r.avg;
      else e.t = r.avg;
      byHour.set(r.hour, e);
    }
    const day = localParts(sampledAt, timeZone).day;
    const series = [...byHour.entries()]
      .filter((e): e is [number, { ph: number; t: number }] => e[1].ph !== undefined && e[1].t !== undefined)
      .map(([hour, v]) => ({ at: zonedTime(day, hour, 30, timeZone).toISOString(), pH: v.ph, temperatureC: v.t, hour }));
    if (series.length < 12) return null;
    const peak = forecastPeakNh3({ tanMgL, series, salinityPpt, ...(method ? { method } : {}) });
    const peakLocal = localParts(new Date(peak.at), timeZone);
    const testLocal = localParts(sampledAt, timeZone);
    const morningTestNote =
      testLocal.hour < 12 && peakLocal.hour >= 12 && peak.nh3MgL > 1.25 * measuredNh3MgL
        ? `Tested at ${hhmm(testLocal.hour, testLocal.minute)}: free ammonia is likely about ${Math.round((peak.nh3MgL / Math.max(measuredNh3MgL, 1e-9)) * 10) / 10}× higher near ${hhmm(peakLocal.hour, peakLocal.minute)}. Morning tests understate the afternoon peak; test in the afternoon too.`
        : null;
    return {
      nh3NMgL: peak.nh3NMgL,
      nh3MgL: peak.nh3MgL,
      at: peak.at,
      localTime: hhmm(peakLocal.hour, peakLocal.minute),
      basedOnHours: 72,
      morningTestNote,
    };
  }
}

function snapshot(t: WaterTest): Record<string, unknown> {
  return {
    method: t.method,
    basis: t.basis,
    value: t.value,
    sampledAt: t.sampledAt.toISOString(),
    handheldPh: t.handheldPh,
    handheldTemperatureC: t.handheldTemperatureC,
    handheldSalinityPpt: t.handheldSalinityPpt,
    note: t.note,
    version: t.version,
  };
}
