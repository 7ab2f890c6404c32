import { MoreThan, type DataSource } from 'typeorm';
import { Probe, ProbeCalibration, ProbeMaintenanceWindow } from '../../db/entities';

export type RejectRow = { probeId: string; probeKey: string; reason: string; count: number; lastAt: Date; lastDetail: string | null };

export class ProbesRepository {
  constructor(private readonly ds: DataSource) {}

  listByFarm(farmId: string, filter: { unitId?: string | undefined } = {}): Promise<Probe[]> {
    return this.ds.getRepository(Probe).find({
      where: { farmId, ...(filter.unitId ? { unitId: filter.unitId } : {}) },
      order: { label: 'ASC', createdAt: 'ASC' },
    });
  }
  find(farmId: string, probeId: string): Promise<Probe | null> {
    return this.ds.getRepository(Probe).findOneBy({ id: probeId, farmId });
  }
  async insert(row: Partial<Probe>): Promise<Probe | 'key_taken'> {
    const repo = this.ds.getRepository(Probe);
    try {
      return await repo.save(repo.create(row));
    } catch (err) {
      if ((err as { code?: string }).code === '23505') return 'key_taken';
      throw err;
    }
  }
  save(probe: Probe): Promise<Probe> {
    return this.ds.getRepository(Probe).save(probe);
  }

  async insertCalibration(row: Omit<ProbeCalibration, 'id' | 'createdAt'>): Promise<ProbeCalibration> {
    const repo = this.ds.getRepository(ProbeCalibration);
    return repo.save(repo.create(row));
  }
  listCalibrations(probeId: string, limit = 100): Promise<ProbeCalibration[]> {
    return this.ds
      .getRepository(ProbeCalibration)
      .find({ where: { probeId }, order: { performedAt: 'DESC', createdAt: 'DESC' }, take: limit });
  }

  async insertWindow(row: Omit<ProbeMaintenanceWindow, 'id' | 'createdAt'>): Promise<ProbeMaintenanceWindow> {
    const repo = this.ds.getRepository(ProbeMaintenanceWindow);
    return repo.save(repo.create(row));
  }
  /** Windows not yet over, and those that ended within `keepEndedMs`, newest start first. */
  listWindows(probeId: string, endedAfter: Date): Promise<ProbeMaintenanceWindow[]> {
    return this.ds
      .getRepository(ProbeMaintenanceWindow)
      .find({ where: { probeId, endsAt: MoreThan(endedAfter) }, order: { startsAt: 'DESC' } });
  }
  findWindow(probeId: string, windowId: string): Promise<ProbeMaintenanceWindow | null> {
    return this.ds.getRepository(ProbeMaintenanceWindow).findOneBy({ id: windowId, probeId });
  }
  async deleteWindow(windowId: string): Promise<void> {
    await this.ds.getRepository(ProbeMaintenanceWindow).delete({ id: windowId });
  }

  /** Stored reject counters (written by ingest) of the farm's probes. */
  async rejectsOfFarm(farmId: string): Promise<RejectRow[]> {
    const rows = (await this.ds.query(
      `SELECT p.id AS probe_id, r.probe_key, r.reason, r.count, r.last_at, r.last_detail
       FROM probe_rejects r JOIN probes p ON p.probe_key = r.probe_key
       WHERE p.farm_id = $1 ORDER BY r.probe_key, r.reason`,
      [farmId],
    )) as Array<{ probe_id: string; probe_key: string; reason: string; count: string; last_at: Date; last_detail: string | null }>;
    return rows.map((r) => ({
      probeId: r.probe_id,
      probeKey: r.probe_key,
      reason: r.reason,
      count: Number(r.count),
      lastAt: r.last_at,
      lastDetail: r.last_detail,
    }));
  }
}
