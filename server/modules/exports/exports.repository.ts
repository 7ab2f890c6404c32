import type { DataSource } from 'typeorm';
import { CultureUnit, Farm, Probe } from '../../db/entities';

// Reads for CSV downloads. Large ranges are read through a PostgreSQL cursor (DECLARE … FETCH) inside
// a read-only transaction on one pooled connection, a batch at a time: memory stays bounded by the
// batch size, however many rows the range holds.

const FETCH_ROWS = 2000;

export type ReadingSampleRow = {
  time_utc: string;
  time_local: string;
  ph: number | null;
  water_temperature: number | null;
  salinity: number | null;
  conductivity: number | null;
  specific_conductance: number | null;
  dissolved_oxygen: number | null;
  flow: number | null;
  water_level: number | null;
  aerator_running: number | null;
  pump_running: number | null;
  flags: string | null;
};

export type TestExportRow = {
  id: string;
  time_utc: string;
  time_local: string;
  unit_code: string;
  analyte: string;
  method: string;
  basis: string;
  value: number;
  unit: string;
  handheld_ph: number | null;
  handheld_temperature_c: number | null;
  handheld_salinity_ppt: number | null;
  aerator_on: boolean | null;
  note: string | null;
  source: string;
  entered_by: string | null;
  version: number;
};

export type ResultExportRow = {
  water_test_id: string;
  time_utc: string;
  time_local: string;
  unit_code: string;
  status: string;
  tan_mg_l: number | null;
  nh3_n_mg_l: number | null;
  nh3_mg_l: number | null;
  fraction: number | null;
  ph: number | null;
  temperature_c: number | null;
  salinity_ppt: number | null;
  method: string | null;
  ph_scale: string | null;
  provenance: { values?: Array<{ quantity?: string; source?: string; probeLabel?: string | null }> } | null;
  flags: Array<{ code: string; message: string }> | null;
  forecast_peak: { nh3MgL?: number; localTime?: string } | null;
  computed_at_utc: string;
  kit_method: string;
  kit_value: number;
  kit_basis: string;
};

const utc = (col: string) => `to_char(${col} AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`;
const local = (col: string, tzParam: string) => `to_char(${col} AT TIME ZONE ${tzParam}, 'YYYY-MM-DD HH24:MI:SS')`;

export class ExportsRepository {
  constructor(private readonly ds: DataSource) {}

  findFarm(farmId: string): Promise<Farm | null> {
    return this.ds.getRepository(Farm).findOneBy({ id: farmId });
  }

  findUnit(farmId: string, unitId: string): Promise<CultureUnit | null> {
    return this.ds.getRepository(CultureUnit).findOneBy({ id: unitId, farmId });
  }

  /** The farm's probes (optionally of one unit) with their unit's code, in unit code and label order. */
  async probes(farmId: string, unitId: string | null): Promise<Array<{ probe: Probe; unitCode: string | null }>> {
    const probes = await this.ds.getRepository(Probe).find({ where: unitId ? { farmId, unitId } : { farmId } });
    const units = await this.ds.getRepository(CultureUnit).find({ where: { farmId }, select: { id: true, code: true } });
    const codes = new Map(units.map((u) => [u.id, u.code]));
    return probes
      .map((probe) => ({ probe, unitCode: probe.unitId ? (codes.get(probe.unitId) ?? null) : null }))
      .sort((a, b) => (a.unitCode ?? '~').localeCompare(b.unitCode ?? '~') || a.probe.label.localeCompare(b.probe.label));
  }

  /** Yields the rows of `sql` a batch at a time from a server-side cursor; stopping early closes it. */
  private async *cursor<T>(sql: string, params: unknown[]): AsyncGenerator<T[]> {
    const runner = this.ds.createQueryRunner();
    await runner.connect();
    try {
      await runner.query('BEGIN TRANSACTION READ ONLY');
      await runner.query(`DECLARE gw_export NO SCROLL CURSOR FOR ${sql}`, params);
      for (;;) {
        const rows = (await runner.query(`FETCH ${FETCH_ROWS} FROM gw_export`)) as T[];
        if (rows.length) yield rows;
        if (rows.length < FETCH_ROWS) break;
      }
    } finally {
      await runner.query('ROLLBACK').catch(() => undefined);
      await runner.release();
    }
  }

  /** One row per sample of one probe (time), one column per quantity, quality flags alongside. */
  readingSamples(probeId: string, from: Date, to: Date, timeZone: string): AsyncGenerator<ReadingSampleRow[]> {
    const q = (name: string) => `max(value) FILTER (WHERE quantity = '${name}') AS ${name}`;
    return this.cursor<ReadingSampleRow>(
      `SELECT ${utc('at')} AS time_utc, ${local('at', '$4')} AS time_local,
              ${['ph', 'water_temperature', 'salinity', 'conductivity', 'specific_conductance', 'dissolved_oxygen', 'flow', 'water_level', 'aerator_running', 'pump_running'].map(q).join(', ')},
              string_agg(quantity || ':' || quality, ' ' ORDER BY quantity) FILTER (WHERE quality <> 'good') AS flags
       FROM readings
       WHERE probe_id = $1 AND at >= $2 AND at < $3
       GROUP BY at
       ORDER BY at`,
      [probeId, from.toISOString(), to.toISOString(), timeZone],
    );
  }

  tests(farmId: string, unitId: string | null, from: Date, to: Date, timeZone: string): AsyncGenerator<TestExportRow[]> {
    return this.cursor<TestExportRow>(
      `SELECT w.id, ${utc('w.sampled_at')} AS time_utc, ${local('w.sampled_at', '$4')} AS time_local, u.code AS unit_code,
              w.analyte, w.method, w.basis, w.value, w.unit, w.handheld_ph, w.handheld_temperature_c, w.handheld_salinity_ppt,
              w.aerator_on, w.note, w.source, e.name AS entered_by, w.version
       FROM water_tests w
       JOIN culture_units u ON u.id = w.unit_id
       LEFT JOIN users e ON e.id = w.entered_by_id
       WHERE w.farm_id = $1 AND w.sampled_at >= $2 AND w.sampled_at < $3 AND ($5::uuid IS NULL OR w.unit_id = $5)
       ORDER BY w.sampled_at, w.id`,
      [farmId, from.toISOString(), to.toISOString(), timeZone, unitId],
    );
  }

  results(farmId: string, unitId: string | null, from: Date, to: Date, timeZone: string): AsyncGenerator<ResultExportRow[]> {
    return this.cursor<ResultExportRow>(
      `SELECT r.water_test_id, ${utc('r.sampled_at')} AS time_utc, ${local('r.sampled_at', '$4')} AS time_local, u.code AS unit_code,
              r.status, r.tan_mg_l, r.nh3_n_mg_l, r.nh3_mg_l, r.fraction, r.ph, r.temperature_c, r.salinity_ppt, r.method, r.ph_scale,
              r.provenance, r.flags, r.forecast_peak, ${utc('r.computed_at')} AS computed_at_utc,
              w.method AS kit_method, w.value AS kit_value, w.basis AS kit_basis
       FROM free_ammonia_results r
       JOIN water_tests w ON w.id = r.water_test_id
       JOIN culture_units u ON u.id = r.unit_id
       WHERE r.farm_id = $1 AND r.sampled_at >= $2 AND r.sampled_at < $3 AND ($5::uuid IS NULL OR r.unit_id = $5)
       ORDER BY r.sampled_at, r.id`,
      [farmId, from.toISOString(), to.toISOString(), timeZone, unitId],
    );
  }
}
