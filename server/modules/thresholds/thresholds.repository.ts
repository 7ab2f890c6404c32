import { In, type DataSource } from 'typeorm';
import { CultureUnit, ThresholdProfile } from '../../db/entities';

export class ThresholdsRepository {
  constructor(private readonly ds: DataSource) {}

  list(farmId: string): Promise<ThresholdProfile[]> {
    return this.ds.getRepository(ThresholdProfile).find({ where: { farmId }, order: { name: 'ASC' } });
  }
  find(farmId: string, profileId: string): Promise<ThresholdProfile | null> {
    return this.ds.getRepository(ThresholdProfile).findOneBy({ id: profileId, farmId });
  }
  byIds(ids: string[]): Promise<ThresholdProfile[]> {
    if (!ids.length) return Promise.resolve([]);
    return this.ds.getRepository(ThresholdProfile).findBy({ id: In(ids) });
  }
  save(profile: ThresholdProfile): Promise<ThresholdProfile> {
    return this.ds.getRepository(ThresholdProfile).save(profile);
  }
  /** profile id → ids of the farm's units that use it. */
  async unitsByProfile(farmId: string): Promise<Map<string, string[]>> {
    const units = await this.ds.getRepository(CultureUnit).find({ where: { farmId }, select: { id: true, thresholdProfileId: true }, order: { walkOrder: 'ASC' } });
    const map = new Map<string, string[]>();
    for (const u of units) {
      if (!u.thresholdProfileId) continue;
      map.set(u.thresholdProfileId, [...(map.get(u.thresholdProfileId) ?? []), u.id]);
    }
    return map;
  }
}
