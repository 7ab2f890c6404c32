import type { ProbeFinding, ProbeHealth } from '../../../shared/schemas/probes.schema';
import type { Quantity } from '../../../shared/schemas/mqtt.schema';

/**
 * Probe health rules (husbandry.md §5 "drift and fouling"; the numbers are product decisions unless
 * marked). The alerts module turns findings into alarms; these only describe what is seen.
 */
export const HEALTH_RULES = {
  /** A stuck sensor repeats one value: this many identical readings spanning at least this long. */
  flatline: { quantities: ['ph', 'dissolved_oxygen', 'water_temperature'] as Quantity[], minReadings: 30, minMinutes: 30, epsilon: 1e-9 },
  /** Readings ingest flagged 'suspect' (implausible step, shared/units.ts plausibleStepPerMinute). */
  spike: { windowHours: 24, minSuspect: 1 },
  /** Probe vs handheld values typed with kit tests, paired within ±15 min; mean of the last 5 pairs. */
  drift: { windowMinutes: 15, pairs: 5, minPairs: 3, threshold: { ph: 0.3, water_temperature: 1 } as const },
  /** Quantities whose sensors need calibrating; a quantity never calibrated is due. */
  calibration: { quantities: ['ph', 'dissolved_oxygen', 'conductivity', 'specific_conductance', 'salinity'] as Quantity[] },
} as const;

export type FlatTail = { quantity: Quantity; n: number; lo: number; hi: number; firstAt: Date; lastAt: Date };
export type FlatRun = { quantity: Quantity; value: number; readings: number; sinceAt: Date; lastAt: Date };
export type DriftPair = { quantity: 'ph' | 'water_temperature'; probeValue: number; handheldValue: number; at: Date };

/** Everything evaluate() knows about one probe, gathered in a few farm-wide queries. */
export type ProbeFacts = {
  probe: {
    id: string;
    probeKey: string;
    unitId: string | null;
    active: boolean;
    quantities: Quantity[];
    intervalSeconds: number;
    createdAt: Date;
    lastSeenAt: Date | null;
    batteryPct: number | null;
    rssiDbm: number | null;
  };
  lastReadingAt: Date | null;
  /** The maintenance window the probe is in now, if any. */
  window: { id: string; reason: string; endsAt: Date } | null;
  flatRuns: FlatRun[];
  suspects: Array<{ quantity: Quantity; count: number; lastAt: Date }>;
  /** Newest first, since the quantity's last passed calibration. */
  pairs: DriftPair[];
  /** Newest calibration per quantity. */
  calibrations: Array<{ quantity: string; performedAt: Date; nextDueAt: Date }>;
  rejects: Array<{ reason: string; count: number; lastAt: Date; lastDetail: string | null }>;
};

/** Whether the newest readings of a quantity look stuck (before measuring the whole run). */
export function isFlatTail(t: FlatTail): boolean {
  const r = HEALTH_RULES.flatline;
  return t.n >= r.minReadings && t.hi - t.lo <= r.epsilon;
}

/** A measured run is a flatline when it holds enough readings and lasts long enough. */
export function isFlatline(run: FlatRun): boolean {
  const r = HEALTH_RULES.flatline;
  return run.readings >= r.minReadings && (run.lastAt.getTime() - run.sinceAt.getTime()) / 60_000 >= r.minMinutes;
}

/** Turns one probe's facts into findings and a state. Pure: same facts and `now`, same answer. */
export function assessProbe(facts: ProbeFacts, settings: { silentAfterMissedIntervals: number }, now: Date): ProbeHealth {
  const { probe } = facts;
  const base = {
    probeId: probe.id,
    probeKey: probe.probeKey,
    unitId: probe.unitId,
    lastSeenAt: probe.lastSeenAt?.toISOString() ?? null,
    lastReadingAt: facts.lastReadingAt?.toISOString() ?? null,
    batteryPct: probe.batteryPct,
    rssiDbm: probe.rssiDbm,
    rejects: facts.rejects.map((r) => ({ reason: r.reason, count: r.count, lastAt: r.lastAt.toISOString(), lastDetail: r.lastDetail })),
  };
  if (!probe.active) return { ...base, state: 'inactive', findings: [] };

  const findings: ProbeFinding[] = [];
  const deployed = probe.unitId !== null;
  const thresholdSeconds = settings.silentAfterMissedIntervals * probe.intervalSeconds;
  const since = facts.lastReadingAt ?? probe.createdAt;
  const silentForSeconds = Math.max(0, Math.round((now.getTime() - since.getTime()) / 1000));
  const silent = deployed && silentForSeconds > thresholdSeconds;

  if (facts.window) {
    // While out for cleaning or calibration: no silence or data-quality findings.
    findings.push({
      kind: 'maintenance',
      windowId: facts.window.id,
      reason: facts.window.reason,
      endsAt: facts.window.endsAt.toISOString(),
    });
  } else if (deployed) {
    if (silent)
      findings.push({ kind: 'silent', lastReadingAt: facts.lastReadingAt?.toISOString() ?? null, silentForSeconds, thresholdSeconds });
    // A silent probe's last readings are old news: flatline is only judged on a reporting probe.
    if (!silent) {
      for (const run of facts.flatRuns.filter(isFlatline)) {
        findings.push({
          kind: 'flatline',
          quantity: run.quantity,
          value: run.value,
          readings: run.readings,
          sinceAt: run.sinceAt.toISOString(),
          minutes: Math.round((run.lastAt.getTime() - run.sinceAt.getTime()) / 60_000),
        });
      }
    }
    for (const s of facts.suspects) {
      if (s.count >= HEALTH_RULES.spike.minSuspect)
        findings.push({ kind: 'spike', quantity: s.quantity, suspectCount: s.count, lastAt: s.lastAt.toISOString() });
    }
    for (const quantity of ['ph', 'water_temperature'] as const) {
      const pairs = facts.pairs.filter((p) => p.quantity === quantity).slice(0, HEALTH_RULES.drift.pairs);
      if (pairs.length < HEALTH_RULES.drift.minPairs) continue;
      const mean = pairs.reduce((sum, p) => sum + (p.probeValue - p.handheldValue), 0) / pairs.length;
      const threshold = HEALTH_RULES.drift.threshold[quantity];
      if (Math.abs(mean) > threshold) {
        findings.push({ kind: 'drift', quantity, meanDifference: Math.round(mean * 1000) / 1000, threshold, pairs: pairs.length });
      }
    }
  }

  const latestCal = new Map(facts.calibrations.map((c) => [c.quantity, c]));
  for (const quantity of HEALTH_RULES.calibration.quantities) {
    if (!probe.quantities.includes(quantity)) continue;
    const cal = latestCal.get(quantity);
    if (!cal || cal.nextDueAt.getTime() < now.getTime()) {
      findings.push({
        kind: 'calibration_due',
        quantity,
        nextDueAt: cal?.nextDueAt.toISOString() ?? null,
        lastCalibratedAt: cal?.performedAt.toISOString() ?? null,
      });
    }
  }

  const state = facts.window ? 'maintenance' : silent ? 'silent' : findings.length ? 'attention' : 'ok';
  return { ...base, state, findings };
}
