import type { DataSource, EntityManager } from 'typeorm';
import { CultureUnit, Farm } from '../../db/entities';

export type ImportUnit = { id: string; code: string; name: string };

/** A water test as the importer writes it (source 'import', version 1). */
export type ImportedTestRow = {
  farmId: string;
  unitId: string;
  clientId: string;
  analyte: string;
  method: string;
  basis: string;
  value: number;
  unit: string;
  sampledAt: string;
  handheldPh: number | null;
  handheldTemperatureC: number | null;
  handheldSalinityPpt: number | null;
  note: string | null;
  enteredById: string | null;
};

export type WrittenTest = { id: string; analyte: string; unitId: string };

/** Writes inside one open transaction; nothing is visible to others until the transaction commits. */
export type ImportWriter = {
  /** Inserts the rows whose client id is not stored yet; returns the rows actually written. */
  insertTests(rows: ImportedTestRow[]): Promise<WrittenTest[]>;
};

export class ImportsRepository {
  constructor(private readonly ds: DataSource) {}

  findFarm(farmId: string): Promise<Farm | null> {
    return this.ds.getRepository(Farm).findOneBy({ id: farmId });
  }

  async unitsOfFarm(farmId: string): Promise<ImportUnit[]> {
    const units = await this.ds.getRepository(CultureUnit).find({ where: { farmId }, select: { id: true, code: true, name: true } });
    return units.map((u) => ({ id: u.id, code: u.code, name: u.name }));
  }

  /** Runs `work` in one transaction: every write commits together or, if `work` throws, none does. */
  inTransaction<T>(work: (writer: ImportWriter) => Promise<T>): Promise<T> {
    return this.ds.transaction((manager) => work({ insertTests: (rows) => insertTests(manager, rows) }));
  }
}

async function insertTests(manager: EntityManager, rows: ImportedTestRow[]): Promise<WrittenTest[]> {
  if (!rows.length) return [];
  const col = <K extends keyof ImportedTestRow>(k: K) => rows.map((r) => r[k]);
  // One statement per batch; the unique (farm_id, client_id) index makes a re-run store nothing twice.
  const written = (await manager.query(
    `INSERT INTO water_tests (farm_id, unit_id, client_id, analyte, method, basis, value, unit, sampled_at,
                              handheld_ph, handheld_temperature_c, handheld_salinity_ppt, note, source, entered_by_id, version)
     SELECT t.farm_id, t.unit_id, t.client_id, t.analyte, t.method, t.basis, t.value, t.unit, t.sampled_at,
            t.handheld_ph, t.handheld_temperature_c, t.handheld_salinity_ppt, t.note, 'import', t.entered_by_id, 1
     FROM unnest($1::uuid[], $2::uuid[], $3::uuid[], $4::text[], $5::text[], $6::text[], $7::float8[], $8::text[],
                 $9::timestamptz[], $10::float8[], $11::float8[], $12::float8[], $13::text[], $14::uuid[])
          AS t(farm_id, unit_id, client_id, analyte, method, basis, value, unit, sampled_at,
               handheld_ph, handheld_temperature_c, handheld_salinity_ppt, note, entered_by_id)
     ON CONFLICT (farm_id, client_id) DO NOTHING
     RETURNING id, analyte, unit_id AS "unitId"`,
    [
      col('farmId'),
      col('unitId'),
      col('clientId'),
      col('analyte'),
      col('method'),
      col('basis'),
      col('value'),
      col('unit'),
      col('sampledAt'),
      col('handheldPh'),
      col('handheldTemperatureC'),
      col('handheldSalinityPpt'),
      col('note'),
      col('enteredById'),
    ],
  )) as WrittenTest[];
  return written;
}
