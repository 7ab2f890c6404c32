import type { DataSource } from 'typeorm';
import { CultureUnit, Observation } from '../../db/entities';

export class ObservationsRepository {
  constructor(private readonly ds: DataSource) {}
  findUnit(farmId: string, unitId: string) {
    return this.ds.getRepository(CultureUnit).findOneBy({ id: unitId, farmId });
  }
  findByClientId(farmId: string, clientId: string) {
    return this.ds.getRepository(Observation).findOneBy({ farmId, clientId });
  }
  save(o: Partial<Observation>): Promise<Observation> {
    return this.ds.getRepository(Observation).save(this.ds.getRepository(Observation).create(o));
  }
  /** Extends the unit's closer watch; never shortens one already longer. */
  async extendCloseWatch(unitId: string, until: Date): Promise<Date> {
    await this.ds.query(`UPDATE culture_units SET close_watch_until = GREATEST(COALESCE(close_watch_until, $2), $2) WHERE id = $1`, [unitId, until.toISOString()]);
    const unit = await this.ds.getRepository(CultureUnit).findOneByOrFail({ id: unitId });
    return unit.closeWatchUntil ?? until;
  }
  list(unitId: string, limit = 200): Promise<Observation[]> {
    return this.ds.getRepository(Observation).find({ where: { unitId }, order: { observedAt: 'DESC' }, take: limit });
  }
}
