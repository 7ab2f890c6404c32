import type { DataSource } from 'typeorm';
import { CultureUnit, Farm } from '../../db/entities';

export class TasksRepository {
  constructor(private readonly ds: DataSource) {}
  findFarm(farmId: string) {
    return this.ds.getRepository(Farm).findOneBy({ id: farmId });
  }
  units(farmId: string): Promise<CultureUnit[]> {
    return this.ds.getRepository(CultureUnit).find({ where: { farmId }, order: { walkOrder: 'ASC', code: 'ASC' } });
  }
  /** The latest total-ammonia test per unit of the farm. */
  async lastAmmoniaTests(farmId: string): Promise<Map<string, Date>> {
    const rows = (await this.ds.query(
      `SELECT unit_id AS "unitId", max(sampled_at) AS at FROM water_tests WHERE farm_id = $1 AND analyte = 'total_ammonia' GROUP BY unit_id`,
      [farmId],
    )) as Array<{ unitId: string; at: Date }>;
    return new Map(rows.map((r) => [r.unitId, new Date(r.at)]));
  }
}
