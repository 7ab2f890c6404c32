import type { DataSource } from 'typeorm';
import { CultureUnit, FlowMeasurement } from '../../db/entities';

const isUniqueViolation = (err: unknown) => (err as { code?: string } | null)?.code === '23505';

export class UnitsRepository {
  constructor(private readonly ds: DataSource) {}

  list(
    farmId: string,
    filter: { kind?: CultureUnit['kind'] | undefined; state?: CultureUnit['state'] | undefined } = {},
  ): Promise<CultureUnit[]> {
    return this.ds.getRepository(CultureUnit).find({
      where: { farmId, ...(filter.kind ? { kind: filter.kind } : {}), ...(filter.state ? { state: filter.state } : {}) },
      order: { walkOrder: 'ASC', code: 'ASC' },
    });
  }
  find(farmId: string, unitId: string): Promise<CultureUnit | null> {
    return this.ds.getRepository(CultureUnit).findOneBy({ id: unitId, farmId });
  }
  findByCode(farmId: string, code: string): Promise<CultureUnit | null> {
    return this.ds.getRepository(CultureUnit).findOneBy({ farmId, code });
  }
  findByLabel(farmId: string, qrLabelId: string): Promise<CultureUnit | null> {
    return this.ds.getRepository(CultureUnit).findOneBy({ farmId, qrLabelId });
  }
  async nextWalkOrder(farmId: string): Promise<number> {
    const rows = (await this.ds.query(`SELECT COALESCE(max(walk_order) + 1, 0)::int AS next FROM culture_units WHERE farm_id = $1`, [
      farmId,
    ])) as Array<{ next: number }>;
    return rows[0]?.next ?? 0;
  }
  /** Threshold profiles belong to the thresholds module; this only checks that the id names one of this farm's. */
  async thresholdProfileOnFarm(farmId: string, profileId: string): Promise<boolean> {
    const rows = (await this.ds.query(`SELECT 1 FROM threshold_profiles WHERE id = $1 AND farm_id = $2`, [profileId, farmId])) as unknown[];
    return rows.length > 0;
  }

  /** Inserts the unit; 'code_taken' when the farm already has the code (unique index, so races lose too). */
  async insert(row: Partial<CultureUnit>): Promise<CultureUnit | 'code_taken'> {
    const repo = this.ds.getRepository(CultureUnit);
    try {
      return await repo.save(repo.create(row));
    } catch (err) {
      if (isUniqueViolation(err)) return 'code_taken';
      throw err;
    }
  }
  async save(unit: CultureUnit): Promise<CultureUnit | 'code_taken'> {
    try {
      return await this.ds.getRepository(CultureUnit).save(unit);
    } catch (err) {
      if (isUniqueViolation(err)) return 'code_taken';
      throw err;
    }
  }

  async insertFlow(row: Omit<FlowMeasurement, 'id' | 'createdAt'>): Promise<FlowMeasurement> {
    const repo = this.ds.getRepository(FlowMeasurement);
    return repo.save(repo.create(row));
  }
  listFlows(unitId: string, limit: number): Promise<FlowMeasurement[]> {
    return this.ds
      .getRepository(FlowMeasurement)
      .find({ where: { unitId }, order: { measuredAt: 'DESC', createdAt: 'DESC' }, take: limit });
  }
  latestFlow(unitId: string, source?: FlowMeasurement['source']): Promise<FlowMeasurement | null> {
    return this.ds
      .getRepository(FlowMeasurement)
      .findOne({ where: { unitId, ...(source ? { source } : {}) }, order: { measuredAt: 'DESC', createdAt: 'DESC' } });
  }
}
