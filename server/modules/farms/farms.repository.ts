import { In, type DataSource } from 'typeorm';
import { Farm } from '../../db/entities';

export class FarmsRepository {
  constructor(private readonly ds: DataSource) {}

  all(): Promise<Farm[]> {
    return this.ds.getRepository(Farm).find({ order: { name: 'ASC' } });
  }
  byIds(ids: string[]): Promise<Farm[]> {
    if (!ids.length) return Promise.resolve([]);
    return this.ds.getRepository(Farm).find({ where: { id: In(ids) }, order: { name: 'ASC' } });
  }
  find(id: string): Promise<Farm | null> {
    return this.ds.getRepository(Farm).findOneBy({ id });
  }
  findBySlug(slug: string): Promise<Farm | null> {
    return this.ds.getRepository(Farm).findOneBy({ slug });
  }
  /** Settings and time zone only: the hot path for other modules (worker evaluations, reports). */
  findSettings(id: string): Promise<Pick<Farm, 'id' | 'slug' | 'timeZone' | 'settings'> | null> {
    return this.ds.getRepository(Farm).findOne({ where: { id }, select: { id: true, slug: true, timeZone: true, settings: true } });
  }
  async insert(row: Partial<Farm>): Promise<Farm | 'slug_taken'> {
    const repo = this.ds.getRepository(Farm);
    try {
      return await repo.save(repo.create(row));
    } catch (err) {
      if ((err as { code?: string }).code === '23505') return 'slug_taken';
      throw err;
    }
  }
  save(farm: Farm): Promise<Farm> {
    return this.ds.getRepository(Farm).save(farm);
  }
}
