import type { DataSource } from 'typeorm';
import { CultureUnit, Farm, Treatment } from '../../db/entities';

export class TreatmentsRepository {
  constructor(private readonly ds: DataSource) {}
  findUnit(farmId: string, unitId: string) {
    return this.ds.getRepository(CultureUnit).findOneBy({ id: unitId, farmId });
  }
  findFarm(farmId: string) {
    return this.ds.getRepository(Farm).findOneBy({ id: farmId });
  }
  save(t: Partial<Treatment>): Promise<Treatment> {
    return this.ds.getRepository(Treatment).save(this.ds.getRepository(Treatment).create(t));
  }
  update(t: Treatment): Promise<Treatment> {
    return this.ds.getRepository(Treatment).save(t);
  }
  listForUnit(unitId: string, limit = 200): Promise<Treatment[]> {
    return this.ds.getRepository(Treatment).find({ where: { unitId }, order: { startsAt: 'DESC' }, take: limit });
  }
  listForFarm(farmId: string, limit = 500): Promise<Treatment[]> {
    return this.ds.getRepository(Treatment).find({ where: { farmId }, order: { startsAt: 'DESC' }, take: limit });
  }
  /** Daily mean water temperature of a unit's probes per farm-local day, from `from` on. */
  async dailyMeanTemperatures(unitId: string, from: Date, timeZone: string): Promise<Array<{ day: string; meanC: number }>> {
    const rows = (await this.ds.query(
      `SELECT to_char((r.at AT TIME ZONE $3)::date, 'YYYY-MM-DD') AS day, avg(r.value) AS mean
       FROM readings r JOIN probes p ON p.id = r.probe_id
       WHERE p.unit_id = $1 AND r.quantity = 'water_temperature' AND r.quality = 'good' AND r.at >= $2
       GROUP BY 1 ORDER BY 1`,
      [unitId, from.toISOString(), timeZone],
    )) as Array<{ day: string; mean: string | number }>;
    return rows.map((r) => ({ day: r.day, meanC: Number(r.mean) }));
  }
}
