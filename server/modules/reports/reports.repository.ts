import type { DataSource } from 'typeorm';
import { MorningReport } from '../../db/entities';

/** The morning report's store and its read model over the night's readings and night-round tests. */
export class ReportsRepository {
  constructor(private readonly ds: DataSource) {}

  find(farmId: string, day: string): Promise<MorningReport | null> {
    return this.ds.getRepository(MorningReport).findOneBy({ farmId, day });
  }
  list(farmId: string, limit: number): Promise<MorningReport[]> {
    return this.ds.getRepository(MorningReport).find({ where: { farmId }, order: { day: 'DESC' }, take: limit });
  }

  /** Stores the day's report once (unique farm + day); answers the stored row and whether this call created it. */
  async insertOnce(row: Pick<MorningReport, 'farmId' | 'day' | 'content' | 'createdAt'>): Promise<{ report: MorningReport; created: boolean }> {
    const res = await this.ds.createQueryBuilder().insert().into(MorningReport).values(row as never).orIgnore().returning('id').execute();
    const created = Array.isArray(res.raw) && res.raw.length > 0;
    const report = await this.find(row.farmId, row.day);
    if (!report) throw new Error('morning report vanished after insert');
    return { report, created };
  }

  /** Claims the e-mailing of a stored report once (several workers may build it at the same time). */
  async claimMailing(id: string, at: Date): Promise<boolean> {
    const rows = (await this.ds.query(
      `UPDATE morning_reports SET content = jsonb_set(content, '{mailing}', to_jsonb($2::text)) WHERE id = $1 AND NOT (content ? 'mailing') AND NOT (content ? 'mailedTo') RETURNING id`,
      [id, at.toISOString()],
    )) as unknown;
    return Array.isArray(rows) && (Array.isArray(rows[0]) ? rows[0].length > 0 : rows.length > 0);
  }
  async markMailed(id: string, to: string[]): Promise<void> {
    await this.ds.query(`UPDATE morning_reports SET content = (content - 'mailing') || jsonb_build_object('mailedTo', $2::jsonb) WHERE id = $1`, [id, JSON.stringify(to)]);
  }
  async releaseMailing(id: string): Promise<void> {
    await this.ds.query(`UPDATE morning_reports SET content = content - 'mailing' WHERE id = $1`, [id]);
  }

  /** Lowest good probe DO per unit in [from, to) with its time. */
  async lowestProbeDo(farmId: string, from: Date, to: Date): Promise<Map<string, { doMgL: number; at: Date; probeId: string }>> {
    const rows = (await this.ds.query(
      `SELECT DISTINCT ON (p.unit_id) p.unit_id, p.id AS probe_id, r.at, r.value
       FROM probes p JOIN readings r ON r.probe_id = p.id
       WHERE p.farm_id = $1 AND p.unit_id IS NOT NULL AND r.quantity = 'dissolved_oxygen' AND r.quality = 'good' AND r.at >= $2 AND r.at < $3
       ORDER BY p.unit_id, r.value ASC, r.at ASC`,
      [farmId, from.toISOString(), to.toISOString()],
    )) as Array<{ unit_id: string; probe_id: string; at: Date; value: number }>;
    return new Map(rows.map((r) => [r.unit_id, { doMgL: Number(r.value), at: new Date(r.at), probeId: r.probe_id }]));
  }

  /**
   * Hours each unit's aerator reported running in [from, to): each reading's state holds until the next
   * reading of that probe, at most 3 reporting intervals (a gap in the data does not count as running).
   */
  async aeratorHours(farmId: string, from: Date, to: Date): Promise<Map<string, number>> {
    const rows = (await this.ds.query(
      `WITH r AS (
         SELECT p.unit_id, p.interval_seconds, rd.at, rd.value,
                lead(rd.at) OVER (PARTITION BY rd.probe_id ORDER BY rd.at) AS next_at
         FROM probes p JOIN readings rd ON rd.probe_id = p.id
         WHERE p.farm_id = $1 AND p.unit_id IS NOT NULL AND rd.quantity = 'aerator_running' AND rd.at >= $2 AND rd.at < $3
       )
       SELECT unit_id,
              sum(CASE WHEN value >= 0.5 THEN extract(epoch FROM (LEAST(COALESCE(next_at, $3::timestamptz), at + make_interval(secs => interval_seconds * 3), $3::timestamptz) - at)) ELSE 0 END) / 3600.0 AS hours,
              count(*)::int AS n
       FROM r GROUP BY unit_id`,
      [farmId, from.toISOString(), to.toISOString()],
    )) as Array<{ unit_id: string; hours: number; n: number }>;
    return new Map(rows.map((r) => [r.unit_id, Number(r.hours)]));
  }

  /** Lowest night-round DO test per unit in [from, to). */
  async lowestSpotDo(farmId: string, from: Date, to: Date): Promise<Map<string, { doMgL: number; at: Date; testId: string }>> {
    const rows = (await this.ds.query(
      `SELECT DISTINCT ON (unit_id) unit_id, id, sampled_at, value FROM water_tests
       WHERE farm_id = $1 AND analyte = 'dissolved_oxygen' AND sampled_at >= $2 AND sampled_at < $3
       ORDER BY unit_id, value ASC, sampled_at ASC`,
      [farmId, from.toISOString(), to.toISOString()],
    )) as Array<{ unit_id: string; id: string; sampled_at: Date; value: number }>;
    return new Map(rows.map((r) => [r.unit_id, { doMgL: Number(r.value), at: new Date(r.sampled_at), testId: r.id }]));
  }
}
