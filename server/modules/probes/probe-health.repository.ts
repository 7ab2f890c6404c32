import type { DataSource } from 'typeorm';
import { quantities as allQuantities, type Quantity } from '../../../shared/schemas/mqtt.schema';
import type { DriftPair, FlatTail } from './probe-health';

/**
 * Read model behind ProbeHealthService: a handful of farm-wide queries, each made of per-(probe,
 * quantity) lookups on pk_readings (probe_id, quantity, at), so the cost follows the number of probes
 * and the last day's data, never the whole history. It also reads water_tests (handheld values typed
 * with kit tests) and probe_rejects (written by ingest), which no service exposes.
 */
export class ProbeHealthRepository {
  constructor(private readonly ds: DataSource) {}

  /** Newest reading time per probe (any quantity, derived salinity included). */
  async lastReadingAt(farmId: string): Promise<Map<string, Date>> {
    const rows = (await this.ds.query(
      `SELECT p.id, max(r.at) AS at
       FROM probes p
       CROSS JOIN unnest($2::text[]) AS q(quantity)
       CROSS JOIN LATERAL (SELECT at FROM readings WHERE probe_id = p.id AND quantity = q.quantity ORDER BY at DESC LIMIT 1) r
       WHERE p.farm_id = $1
       GROUP BY p.id`,
      [farmId, allQuantities],
    )) as Array<{ id: string; at: Date }>;
    return new Map(rows.map((r) => [r.id, r.at]));
  }

  /** Maintenance windows open now, per probe (the latest-ending one if several overlap). */
  async currentWindows(farmId: string, now: Date): Promise<Map<string, { id: string; reason: string; endsAt: Date }>> {
    const rows = (await this.ds.query(
      `SELECT DISTINCT ON (w.probe_id) w.probe_id, w.id, w.reason, w.ends_at
       FROM probe_maintenance_windows w JOIN probes p ON p.id = w.probe_id
       WHERE p.farm_id = $1 AND w.starts_at <= $2 AND w.ends_at > $2
       ORDER BY w.probe_id, w.ends_at DESC`,
      [farmId, now],
    )) as Array<{ probe_id: string; id: string; reason: string; ends_at: Date }>;
    return new Map(rows.map((r) => [r.probe_id, { id: r.id, reason: r.reason, endsAt: r.ends_at }]));
  }

  /** The newest `limit` readings of each flatline-checked quantity of active probes, summarised. */
  async tails(farmId: string, quantities: readonly Quantity[], limit: number): Promise<Array<FlatTail & { probeId: string }>> {
    const rows = (await this.ds.query(
      `SELECT p.id AS probe_id, q.quantity, t.n, t.lo, t.hi, t.first_at, t.last_at
       FROM probes p
       CROSS JOIN unnest($2::text[]) AS q(quantity)
       CROSS JOIN LATERAL (
         SELECT count(*)::int AS n, min(value) AS lo, max(value) AS hi, min(at) AS first_at, max(at) AS last_at
         FROM (SELECT value, at FROM readings WHERE probe_id = p.id AND quantity = q.quantity ORDER BY at DESC LIMIT $3) x
       ) t
       WHERE p.farm_id = $1 AND p.active AND p.unit_id IS NOT NULL AND p.quantities ? q.quantity AND t.n > 0`,
      [farmId, quantities, limit],
    )) as Array<{ probe_id: string; quantity: Quantity; n: number; lo: number; hi: number; first_at: Date; last_at: Date }>;
    return rows.map((r) => ({
      probeId: r.probe_id,
      quantity: r.quantity,
      n: r.n,
      lo: r.lo,
      hi: r.hi,
      firstAt: r.first_at,
      lastAt: r.last_at,
    }));
  }

  /**
   * The whole run of one repeated value ending at the newest reading: walks back from `before` to the
   * last different value (a backward index scan that stops there), then counts the run.
   */
  async flatRun(
    probeId: string,
    quantity: string,
    value: number,
    before: Date,
    epsilon: number,
  ): Promise<{ sinceAt: Date; readings: number }> {
    const rows = (await this.ds.query(
      `WITH brk AS (
         SELECT at FROM readings
         WHERE probe_id = $1 AND quantity = $2 AND at < $3 AND abs(value - $4) > $5
         ORDER BY at DESC LIMIT 1
       )
       SELECT min(r.at) AS since_at, count(*)::int AS n
       FROM readings r
       WHERE r.probe_id = $1 AND r.quantity = $2 AND r.at > COALESCE((SELECT at FROM brk), '-infinity'::timestamptz)`,
      [probeId, quantity, before, value, epsilon],
    )) as Array<{ since_at: Date; n: number }>;
    const r = rows[0];
    return { sinceAt: r?.since_at ?? before, readings: r?.n ?? 0 };
  }

  /** Readings flagged 'suspect' since `since`, per active probe and quantity (range scans of the last day). */
  async suspects(farmId: string, since: Date): Promise<Array<{ probeId: string; quantity: Quantity; count: number; lastAt: Date }>> {
    const rows = (await this.ds.query(
      `SELECT p.id AS probe_id, q.quantity, s.n, s.last_at
       FROM probes p
       CROSS JOIN unnest($2::text[]) AS q(quantity)
       CROSS JOIN LATERAL (
         SELECT count(*)::int AS n, max(at) AS last_at FROM readings
         WHERE probe_id = p.id AND quantity = q.quantity AND at >= $3 AND quality = 'suspect'
       ) s
       WHERE p.farm_id = $1 AND p.active AND s.n > 0`,
      [farmId, allQuantities, since],
    )) as Array<{ probe_id: string; quantity: Quantity; n: number; last_at: Date }>;
    return rows.map((r) => ({ probeId: r.probe_id, quantity: r.quantity, count: r.n, lastAt: r.last_at }));
  }

  /**
   * Probe/handheld pairs for drift, newest first: each kit test of the probe's unit with a handheld
   * value (after the quantity's last passed calibration) paired with the probe reading nearest to it
   * within ±windowMinutes. Tests of one sampling (TAN and nitrite at once) count once.
   */
  async driftPairs(farmId: string, windowMinutes: number, perProbe: number): Promise<Array<DriftPair & { probeId: string }>> {
    const out: Array<DriftPair & { probeId: string }> = [];
    const specs = [
      { quantity: 'ph' as const, column: 'handheld_ph' },
      { quantity: 'water_temperature' as const, column: 'handheld_temperature_c' },
    ];
    for (const { quantity, column } of specs) {
      const rows = (await this.ds.query(
        `SELECT p.id AS probe_id, t.sampled_at, t.handheld, r.value
         FROM probes p
         CROSS JOIN LATERAL (
           SELECT DISTINCT ON (wt.sampled_at) wt.sampled_at, wt.${column} AS handheld
           FROM water_tests wt
           WHERE wt.unit_id = p.unit_id AND wt.${column} IS NOT NULL
             AND wt.sampled_at > COALESCE((SELECT max(c.performed_at) FROM probe_calibrations c
                                           WHERE c.probe_id = p.id AND c.quantity = $2 AND c.passed), '-infinity'::timestamptz)
           ORDER BY wt.sampled_at DESC
           LIMIT $4
         ) t
         CROSS JOIN LATERAL (
           SELECT value FROM readings
           WHERE probe_id = p.id AND quantity = $2 AND quality <> 'bad'
             AND at BETWEEN t.sampled_at - make_interval(mins => $3) AND t.sampled_at + make_interval(mins => $3)
           ORDER BY abs(extract(epoch FROM at - t.sampled_at)) LIMIT 1
         ) r
         WHERE p.farm_id = $1 AND p.active AND p.unit_id IS NOT NULL AND p.quantities ? $2
         ORDER BY p.id, t.sampled_at DESC`,
        [farmId, quantity, windowMinutes, perProbe * 3],
      )) as Array<{ probe_id: string; sampled_at: Date; handheld: number; value: number }>;
      for (const r of rows) out.push({ probeId: r.probe_id, quantity, probeValue: r.value, handheldValue: r.handheld, at: r.sampled_at });
    }
    return out;
  }

  /** Newest calibration per probe and quantity. */
  async latestCalibrations(farmId: string): Promise<Array<{ probeId: string; quantity: string; performedAt: Date; nextDueAt: Date }>> {
    const rows = (await this.ds.query(
      `SELECT DISTINCT ON (c.probe_id, c.quantity) c.probe_id, c.quantity, c.performed_at, c.next_due_at
       FROM probe_calibrations c JOIN probes p ON p.id = c.probe_id
       WHERE p.farm_id = $1
       ORDER BY c.probe_id, c.quantity, c.performed_at DESC, c.created_at DESC`,
      [farmId],
    )) as Array<{ probe_id: string; quantity: string; performed_at: Date; next_due_at: Date }>;
    return rows.map((r) => ({ probeId: r.probe_id, quantity: r.quantity, performedAt: r.performed_at, nextDueAt: r.next_due_at }));
  }
}
