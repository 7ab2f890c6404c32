import { In, type DataSource } from 'typeorm';
import { CultureUnit, StockEvent } from '../../db/entities';

export class StockRepository {
  constructor(private readonly ds: DataSource) {}

  /** The farm's units as entities, in walk order (the units service lists presented units). */
  unitsOfFarm(farmId: string): Promise<CultureUnit[]> {
    return this.ds.getRepository(CultureUnit).find({ where: { farmId }, order: { walkOrder: 'ASC', code: 'ASC' } });
  }
  /** All stock events of a unit, oldest first (ties in the order they were entered). */
  listEvents(unitId: string): Promise<StockEvent[]> {
    return this.ds.getRepository(StockEvent).find({ where: { unitId }, order: { at: 'ASC', createdAt: 'ASC' } });
  }
  eventsOfUnits(unitIds: string[]): Promise<StockEvent[]> {
    if (!unitIds.length) return Promise.resolve([]);
    return this.ds.getRepository(StockEvent).find({ where: { unitId: In(unitIds) }, order: { at: 'ASC', createdAt: 'ASC' } });
  }
  /** Stores events together (a transfer out and its transfer in), all or none. */
  insertEvents(rows: Array<Partial<StockEvent>>): Promise<StockEvent[]> {
    return this.ds.transaction(async (m) => {
      const saved: StockEvent[] = [];
      for (const row of rows) saved.push(await m.save(m.create(StockEvent, row)));
      return saved;
    });
  }
}
