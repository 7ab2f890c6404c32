import type { DataSource } from 'typeorm';
import { CultureUnit, Farm } from '../../db/entities';

export type RecordUnit = { id: string; code: string; name: string; kind: string };

export type TestRecordRow = {
  id: string;
  unit_id: string;
  sampled_at: Date;
  analyte: string;
  method: string;
  basis: string;
  value: number;
  unit: string;
  handheld_ph: number | null;
  handheld_temperature_c: number | null;
  handheld_salinity_ppt: number | null;
  note: string | null;
  source: string;
  version: number;
  entered_by: string | null;
  r_status: string | null;
  r_tan_mg_l: number | null;
  r_nh3_n_mg_l: number | null;
  r_nh3_mg_l: number | null;
  r_method: string | null;
  r_ph: number | null;
  r_temperature_c: number | null;
  r_salinity_ppt: number | null;
  r_provenance: { values?: Array<{ quantity?: string; value?: number; source?: string; probeLabel?: string | null }> } | null;
  r_flags: Array<{ code: string; message: string }> | null;
  r_computed_at: Date | null;
  r_test_version: number | null;
};

export type TreatmentRecordRow = {
  id: string;
  unit_id: string;
  product: string;
  product_name: string | null;
  dose: number | null;
  dose_unit: string | null;
  starts_at: Date;
  ends_at: Date | null;
  withdrawal_days: number | null;
  withdrawal_degree_days: number | null;
  withdrawal_ends_at: Date | null;
  note: string | null;
  recorded_by: string | null;
};

export type MortalityRecordRow = {
  id: string;
  unit_id: string;
  at: Date;
  count: number | null;
  total_weight_kg: number | null;
  note: string | null;
  recorded_by: string | null;
};

export type FeedingRecordRow = {
  id: string;
  unit_id: string;
  day: string;
  fed_kg: number;
  withheld: boolean;
  reason: string | null;
  response: string | null;
  fed_at: Date;
  recorded_by: string | null;
};

export type Period = { from: Date; to: Date; fromDay: string; toDay: string };

const unitFilter = (alias: string, n: number) => `($${n}::uuid IS NULL OR ${alias}.unit_id = $${n})`;

export class RecordsRepository {
  constructor(private readonly ds: DataSource) {}

  findFarm(farmId: string): Promise<Farm | null> {
    return this.ds.getRepository(Farm).findOneBy({ id: farmId });
  }

  async units(farmId: string): Promise<RecordUnit[]> {
    const units = await this.ds.getRepository(CultureUnit).find({ where: { farmId }, order: { code: 'ASC' } });
    return units.map((u) => ({ id: u.id, code: u.code, name: u.name, kind: u.kind }));
  }

  /** Tests sampled in the period with their computed result (any version) and who entered them. */
  tests(farmId: string, p: Period, unitId: string | null): Promise<TestRecordRow[]> {
    return this.ds.query(
      `SELECT w.id, w.unit_id, w.sampled_at, w.analyte, w.method, w.basis, w.value, w.unit, w.handheld_ph, w.handheld_temperature_c,
              w.handheld_salinity_ppt, w.note, w.source, w.version, e.name AS entered_by,
              r.status AS r_status, r.tan_mg_l AS r_tan_mg_l, r.nh3_n_mg_l AS r_nh3_n_mg_l, r.nh3_mg_l AS r_nh3_mg_l, r.method AS r_method,
              r.ph AS r_ph, r.temperature_c AS r_temperature_c, r.salinity_ppt AS r_salinity_ppt, r.provenance AS r_provenance,
              r.flags AS r_flags, r.computed_at AS r_computed_at, r.test_version AS r_test_version
       FROM water_tests w
       LEFT JOIN free_ammonia_results r ON r.water_test_id = w.id
       LEFT JOIN users e ON e.id = w.entered_by_id
       WHERE w.farm_id = $1 AND w.sampled_at >= $2 AND w.sampled_at < $3 AND ${unitFilter('w', 4)}
       ORDER BY w.sampled_at, w.id`,
      [farmId, p.from.toISOString(), p.to.toISOString(), unitId],
    ) as Promise<TestRecordRow[]>;
  }

  /** Treatments that ran, or whose withdrawal period ran, during the period. */
  treatments(farmId: string, p: Period, unitId: string | null): Promise<TreatmentRecordRow[]> {
    return this.ds.query(
      `SELECT t.id, t.unit_id, t.product, t.product_name, t.dose, t.dose_unit, t.starts_at, t.ends_at, t.withdrawal_days,
              t.withdrawal_degree_days, t.withdrawal_ends_at, t.note, e.name AS recorded_by
       FROM treatments t
       LEFT JOIN users e ON e.id = t.created_by_id
       WHERE t.farm_id = $1 AND t.starts_at < $3
         AND greatest(t.starts_at, coalesce(t.ends_at, t.starts_at), coalesce(t.withdrawal_ends_at, t.starts_at)) >= $2
         AND ${unitFilter('t', 4)}
       ORDER BY t.starts_at, t.id`,
      [farmId, p.from.toISOString(), p.to.toISOString(), unitId],
    ) as Promise<TreatmentRecordRow[]>;
  }

  mortalities(farmId: string, p: Period, unitId: string | null): Promise<MortalityRecordRow[]> {
    return this.ds.query(
      `SELECT s.id, s.unit_id, s.at, s.count, s.total_weight_kg, s.note, e.name AS recorded_by
       FROM stock_events s
       LEFT JOIN users e ON e.id = s.created_by_id
       WHERE s.farm_id = $1 AND s.kind = 'mortality' AND s.at >= $2 AND s.at < $3 AND ${unitFilter('s', 4)}
       ORDER BY s.at, s.id`,
      [farmId, p.from.toISOString(), p.to.toISOString(), unitId],
    ) as Promise<MortalityRecordRow[]>;
  }

  /** Feeding records of the farm-local days of the period. */
  feeding(farmId: string, p: Period, unitId: string | null): Promise<FeedingRecordRow[]> {
    return this.ds.query(
      `SELECT f.id, f.unit_id, to_char(f.day, 'YYYY-MM-DD') AS day, f.fed_kg, f.withheld, f.reason, f.response, f.fed_at, e.name AS recorded_by
       FROM feeding_records f
       LEFT JOIN users e ON e.id = f.recorded_by_id
       WHERE f.farm_id = $1 AND f.day >= $2::date AND f.day <= $3::date AND ${unitFilter('f', 4)}
       ORDER BY f.day, f.fed_at, f.id`,
      [farmId, p.fromDay, p.toDay, unitId],
    ) as Promise<FeedingRecordRow[]>;
  }
}
