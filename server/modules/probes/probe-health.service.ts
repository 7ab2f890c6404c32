import type { ProbeHealth } from '../../../shared/schemas/probes.schema';
import type { Probe } from '../../db/entities';
import type { FarmsService } from '../farms/farms.service';
import { assessProbe, HEALTH_RULES, isFlatTail, type FlatRun, type ProbeFacts } from './probe-health';
import type { ProbeHealthRepository } from './probe-health.repository';
import type { ProbesRepository, RejectRow } from './probes.repository';

const HOUR = 3600_000;

export class ProbeHealthService {
  constructor(
    private readonly probes: ProbesRepository,
    private readonly repo: ProbeHealthRepository,
    private readonly farms: FarmsService,
  ) {}

  /**
   * Health of every probe of a farm: silent, maintenance, flatline, spike, drift and calibration-due
   * findings (rules in ./probe-health.ts HEALTH_RULES). Read-only; the alerts module turns findings
   * into alarms. Cost: a fixed handful of queries per farm, independent of stored history.
   */
  async evaluate(farmId: string, now: Date = new Date()): Promise<ProbeHealth[]> {
    return this.evaluateProbes(farmId, await this.probes.listByFarm(farmId), now);
  }

  /** Same as evaluate(), for an already loaded list of the farm's probes (answers in that order). */
  async evaluateProbes(farmId: string, probes: Probe[], now: Date = new Date()): Promise<ProbeHealth[]> {
    if (!probes.length) return [];
    const { flatline, spike, drift } = HEALTH_RULES;
    const [settings, lastAt, windows, tails, suspects, pairs, calibrations, rejects] = await Promise.all([
      this.farms.getSettings(farmId),
      this.repo.lastReadingAt(farmId),
      this.repo.currentWindows(farmId, now),
      this.repo.tails(farmId, flatline.quantities, flatline.minReadings),
      this.repo.suspects(farmId, new Date(now.getTime() - spike.windowHours * HOUR)),
      this.repo.driftPairs(farmId, drift.windowMinutes, drift.pairs),
      this.repo.latestCalibrations(farmId),
      this.probes.rejectsOfFarm(farmId),
    ]);
    // Only stuck-looking tails are measured back to where the value last changed.
    const runs = new Map<string, FlatRun[]>();
    for (const t of tails.filter(isFlatTail)) {
      const run = await this.repo.flatRun(t.probeId, t.quantity, t.hi, t.firstAt, flatline.epsilon);
      const list = runs.get(t.probeId) ?? [];
      list.push({ quantity: t.quantity, value: t.hi, readings: run.readings, sinceAt: run.sinceAt, lastAt: t.lastAt });
      runs.set(t.probeId, list);
    }
    const group = <T extends { probeId: string }>(rows: T[]) => {
      const m = new Map<string, T[]>();
      for (const r of rows) m.set(r.probeId, [...(m.get(r.probeId) ?? []), r]);
      return m;
    };
    const suspectsBy = group(suspects);
    const pairsBy = group(pairs);
    const calsBy = group(calibrations);
    const rejectsBy = group<RejectRow>(rejects);
    return probes.map((p) => {
      const facts: ProbeFacts = {
        probe: {
          id: p.id,
          probeKey: p.probeKey,
          unitId: p.unitId,
          active: p.active,
          quantities: p.quantities,
          intervalSeconds: p.intervalSeconds,
          createdAt: p.createdAt,
          lastSeenAt: p.lastSeenAt,
          batteryPct: p.batteryPct,
          rssiDbm: p.rssiDbm,
        },
        lastReadingAt: lastAt.get(p.id) ?? null,
        window: windows.get(p.id) ?? null,
        flatRuns: runs.get(p.id) ?? [],
        suspects: suspectsBy.get(p.id) ?? [],
        pairs: pairsBy.get(p.id) ?? [],
        calibrations: calsBy.get(p.id) ?? [],
        rejects: rejectsBy.get(p.id) ?? [],
      };
      return assessProbe(facts, settings, now);
    });
  }
}
