import type { DataSource } from 'typeorm';

type ResultRow = {
  id: string;
  unit_id: string;
  water_test_id: string;
  sampled_at: Date;
  status: string;
  tan_mg_l: number | null;
  nh3_mg_l: number | null;
  nh3_n_mg_l: number | null;
  ph: number | null;
  temperature_c: number | null;
  salinity_ppt: number | null;
  flags: Array<{ code: string; message: string }>;
};

export type LatestResultFact = {
  id: string;
  unitId: string;
  waterTestId: string;
  sampledAt: Date;
  status: string;
  tanMgL: number | null;
  nh3MgL: number | null;
  nh3NMgL: number | null;
  ph: number | null;
  temperatureC: number | null;
  salinityPpt: number | null;
  flags: Array<{ code: string; message: string }>;
};

export type TestFact = { id: string; unitId: string; analyte: string; sampledAt: Date; value: number; basis: string };

/**
 * Read model of the unit evaluation: a fixed handful of farm-wide queries over kit results, water tests
 * and probe readings, each an index range or top-1 lookup, so a sweep of every unit of a farm costs the
 * same few queries whatever the history. (The water-tests and readings services answer per unit only.)
 */
export class UnitFactsRepository {
  constructor(private readonly ds: DataSource) {}

  private static result(r: ResultRow): LatestResultFact {
    return {
      id: r.id,
      unitId: r.unit_id,
      waterTestId: r.water_test_id,
      sampledAt: new Date(r.sampled_at),
      status: r.status,
      tanMgL: r.tan_mg_l === null ? null : Number(r.tan_mg_l),
      nh3MgL: r.nh3_mg_l === null ? null : Number(r.nh3_mg_l),
      nh3NMgL: r.nh3_n_mg_l === null ? null : Number(r.nh3_n_mg_l),
      ph: r.ph === null ? null : Number(r.ph),
      temperatureC: r.temperature_c === null ? null : Number(r.temperature_c),
      salinityPpt: r.salinity_ppt === null ? null : Number(r.salinity_ppt),
      flags: r.flags ?? [],
    };
  }

  /** Newest free-ammonia result per unit: with status ok, and of any status (for kit flags). */
  async latestResults(farmId: string, unitIds: string[]): Promise<{ ok: Map<string, LatestResultFact>; any: Map<string, LatestResultFact> }> {
    if (!unitIds.length) return { ok: new Map(), any: new Map() };
    const q = (okOnly: boolean) =>
      this.ds.query(
        `SELECT DISTINCT ON (unit_id) id, unit_id, water_test_id, sampled_at, status, tan_mg_l, nh3_mg_l, nh3_n_mg_l, ph, temperature_c, salinity_ppt, flags
         FROM free_ammonia_results
         WHERE farm_id = $1 AND unit_id = ANY($2::uuid[]) ${okOnly ? `AND status = 'ok'` : ''}
         ORDER BY unit_id, sampled_at DESC, computed_at DESC`,
        [farmId, unitIds],
      ) as Promise<ResultRow[]>;
    const [ok, any] = await Promise.all([q(true), q(false)]);
    return {
      ok: new Map(ok.map((r) => [r.unit_id, UnitFactsRepository.result(r)])),
      any: new Map(any.map((r) => [r.unit_id, UnitFactsRepository.result(r)])),
    };
  }

  /** Newest test per unit of each analyte; `since` bounds spot tests to the recent ones. */
  async latestTests(farmId: string, unitIds: string[], analytes: string[], since: Date | null): Promise<TestFact[]> {
    if (!unitIds.length || !analytes.length) return [];
    const rows = (await this.ds.query(
      `SELECT DISTINCT ON (unit_id, analyte) id, unit_id, analyte, sampled_at, value, basis
       FROM water_tests
       WHERE farm_id = $1 AND unit_id = ANY($2::uuid[]) AND analyte = ANY($3::text[]) AND ($4::timestamptz IS NULL OR sampled_at >= $4)
       ORDER BY unit_id, analyte, sampled_at DESC`,
      [farmId, unitIds, analytes, since ? since.toISOString() : null],
    )) as Array<{ id: string; unit_id: string; analyte: string; sampled_at: Date; value: number; basis: string }>;
    return rows.map((r) => ({ id: r.id, unitId: r.unit_id, analyte: r.analyte, sampledAt: new Date(r.sampled_at), value: Number(r.value), basis: r.basis }));
  }

  /** Per probe: the newest good DO reading between `from` and `to` (the reading "an hour ago"). */
  async doBetween(probeIds: string[], from: Date, to: Date): Promise<Map<string, { value: number; at: Date }>> {
    if (!probeIds.length) return new Map();
    const rows = (await this.ds.query(
      `SELECT p.id, r.at, r.value FROM unnest($1::uuid[]) AS p(id)
       CROSS JOIN LATERAL (
         SELECT at, value FROM readings
         WHERE probe_id = p.id AND quantity = 'dissolved_oxygen' AND quality = 'good' AND at >= $2 AND at <= $3
         ORDER BY at DESC LIMIT 1
       ) r`,
      [probeIds, from.toISOString(), to.toISOString()],
    )) as Array<{ id: string; at: Date; value: number }>;
    return new Map(rows.map((r) => [r.id, { value: Number(r.value), at: new Date(r.at) }]));
  }

  /** Per probe and quantity (aerator_running, pump_running): whether it reported running since `since`. */
  async ranSince(probeIds: string[], since: Date): Promise<Array<{ probeId: string; quantity: string }>> {
    if (!probeIds.length) return [];
    const rows = (await this.ds.query(
      `SELECT DISTINCT probe_id, quantity FROM readings
       WHERE probe_id = ANY($1::uuid[]) AND quantity IN ('aerator_running', 'pump_running') AND at >= $2 AND value >= 0.5`,
      [probeIds, since.toISOString()],
    )) as Array<{ probe_id: string; quantity: string }>;
    return rows.map((r) => ({ probeId: r.probe_id, quantity: r.quantity }));
  }

  /**
   * Good probe DO since `from`, averaged per probe into buckets of `bucketMinutes` (each point at the
   * mean time of its readings), oldest first.
   */
  async doBuckets(probeIds: string[], from: Date, to: Date, bucketMinutes: number): Promise<Array<{ probeId: string; at: Date; doMgL: number }>> {
    if (!probeIds.length) return [];
    const rows = (await this.ds.query(
      `SELECT probe_id, to_timestamp(avg(extract(epoch FROM at))) AS at, avg(value) AS value
       FROM readings
       WHERE probe_id = ANY($1::uuid[]) AND quantity = 'dissolved_oxygen' AND quality = 'good' AND at >= $2 AND at <= $3
       GROUP BY probe_id, date_bin(make_interval(mins => $4), at, $2::timestamptz)
       ORDER BY probe_id, 2`,
      [probeIds, from.toISOString(), to.toISOString(), bucketMinutes],
    )) as Array<{ probe_id: string; at: Date; value: number }>;
    return rows.map((r) => ({ probeId: r.probe_id, at: new Date(r.at), doMgL: Number(r.value) }));
  }

  /** Night-round (spot) DO tests per unit since `from`, oldest first. */
  async spotDoSince(farmId: string, unitIds: string[], from: Date, to: Date): Promise<TestFact[]> {
    if (!unitIds.length) return [];
    const rows = (await this.ds.query(
      `SELECT id, unit_id, analyte, sampled_at, value, basis FROM water_tests
       WHERE farm_id = $1 AND unit_id = ANY($2::uuid[]) AND analyte = 'dissolved_oxygen' AND sampled_at >= $3 AND sampled_at <= $4
       ORDER BY unit_id, sampled_at`,
      [farmId, unitIds, from.toISOString(), to.toISOString()],
    )) as Array<{ id: string; unit_id: string; analyte: string; sampled_at: Date; value: number; basis: string }>;
    return rows.map((r) => ({ id: r.id, unitId: r.unit_id, analyte: r.analyte, sampledAt: new Date(r.sampled_at), value: Number(r.value), basis: r.basis }));
  }
}
