import type { DataSource } from 'typeorm';
import type { ReadingRow } from '../../ingest/reading-handler';

export class ReadingsRepository {
  constructor(private readonly ds: DataSource) {}

  /**
   * Stores rows in one statement; a row already stored (same probe, quantity and time — a re-sent QoS 1
   * message) is skipped by the primary key. Returns how many rows were new.
   */
  async insertBatch(rows: ReadingRow[]): Promise<number> {
    if (!rows.length) return 0;
    const probeIds: string[] = [];
    const quantities: string[] = [];
    const ats: string[] = [];
    const values: number[] = [];
    const qualities: string[] = [];
    for (const r of rows) {
      probeIds.push(r.probeId);
      quantities.push(r.quantity);
      ats.push(r.at.toISOString());
      values.push(r.value);
      qualities.push(r.quality);
    }
    const result: unknown = await this.ds.query(
      `INSERT INTO readings (probe_id, quantity, at, value, quality)
       SELECT * FROM unnest($1::uuid[], $2::text[], $3::timestamptz[], $4::float8[], $5::text[])
       ON CONFLICT ON CONSTRAINT pk_readings DO NOTHING`,
      [probeIds, quantities, ats, values, qualities],
    );
    // TypeORM returns [rows, affected] for INSERT without RETURNING on postgres.
    return Array.isArray(result) && typeof result[1] === 'number' ? result[1] : rows.length;
  }

  async touchProbes(seen: Map<string, { at: Date; batteryPct?: number; rssiDbm?: number }>): Promise<void> {
    if (!seen.size) return;
    const ids = [...seen.keys()];
    const ats = ids.map((id) => seen.get(id)?.at.toISOString() ?? new Date().toISOString());
    const batteries = ids.map((id) => seen.get(id)?.batteryPct ?? null);
    const rssis = ids.map((id) => seen.get(id)?.rssiDbm ?? null);
    await this.ds.query(
      `UPDATE probes p SET last_seen_at = GREATEST(COALESCE(p.last_seen_at, v.at), v.at),
              battery_pct = COALESCE(v.battery, p.battery_pct), rssi_dbm = COALESCE(v.rssi, p.rssi_dbm)
       FROM unnest($1::uuid[], $2::timestamptz[], $3::float8[], $4::float8[]) AS v(id, at, battery, rssi)
       WHERE p.id = v.id`,
      [ids, ats, batteries, rssis],
    );
  }

  async addRejects(counts: Array<{ probeKey: string; reason: string; count: number; lastDetail: string }>): Promise<void> {
    if (!counts.length) return;
    await this.ds.query(
      `INSERT INTO probe_rejects (probe_key, reason, count, last_at, last_detail)
       SELECT k, r, c, now(), d FROM unnest($1::text[], $2::text[], $3::bigint[], $4::text[]) AS v(k, r, c, d)
       ON CONFLICT ON CONSTRAINT pk_probe_rejects
       DO UPDATE SET count = probe_rejects.count + EXCLUDED.count, last_at = now(), last_detail = EXCLUDED.last_detail`,
      [counts.map((c) => c.probeKey), counts.map((c) => c.reason), counts.map((c) => c.count), counts.map((c) => c.lastDetail)],
    );
  }
}
