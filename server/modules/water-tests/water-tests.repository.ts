import { Between, In, LessThanOrEqual, MoreThanOrEqual, type DataSource, type FindOptionsWhere } from 'typeorm';
import { CultureUnit, Farm, FreeAmmoniaResult, Probe, Treatment, WaterTest } from '../../db/entities';

export type NearReading = { probeId: string; at: Date; value: number };

export class WaterTestsRepository {
  constructor(private readonly ds: DataSource) {}

  findUnit(farmId: string, unitId: string): Promise<CultureUnit | null> {
    return this.ds.getRepository(CultureUnit).findOneBy({ id: unitId, farmId });
  }
  findFarm(farmId: string): Promise<Farm | null> {
    return this.ds.getRepository(Farm).findOneBy({ id: farmId });
  }
  findByClientId(farmId: string, clientId: string): Promise<WaterTest | null> {
    return this.ds.getRepository(WaterTest).findOneBy({ farmId, clientId });
  }
  findTest(farmId: string, testId: string): Promise<WaterTest | null> {
    return this.ds.getRepository(WaterTest).findOneBy({ id: testId, farmId });
  }
  findTestById(testId: string): Promise<WaterTest | null> {
    return this.ds.getRepository(WaterTest).findOneBy({ id: testId });
  }
  /** Inserts unless the device's client id is already stored; returns the stored row and whether it is new. */
  async insertOnce(row: Partial<WaterTest>): Promise<{ test: WaterTest; created: boolean }> {
    const res = await this.ds
      .createQueryBuilder()
      .insert()
      .into(WaterTest)
      .values(row)
      .orIgnore()
      .returning('*')
      .execute();
    const created = Array.isArray(res.raw) && res.raw.length > 0;
    const test = await this.findByClientId(row.farmId as string, row.clientId as string);
    if (!test) throw new Error('water test vanished after insert');
    return { test, created };
  }
  saveTest(test: WaterTest): Promise<WaterTest> {
    return this.ds.getRepository(WaterTest).save(test);
  }
  listTests(unitId: string, where: { analyte?: string; from?: Date; to?: Date; limit: number }): Promise<WaterTest[]> {
    const filter: FindOptionsWhere<WaterTest> = { unitId };
    if (where.analyte) filter.analyte = where.analyte;
    if (where.from && where.to) filter.sampledAt = Between(where.from, where.to);
    else if (where.from) filter.sampledAt = MoreThanOrEqual(where.from);
    else if (where.to) filter.sampledAt = LessThanOrEqual(where.to);
    return this.ds.getRepository(WaterTest).find({ where: filter, order: { sampledAt: 'DESC' }, take: where.limit });
  }
  resultsForTests(testIds: string[]): Promise<FreeAmmoniaResult[]> {
    if (!testIds.length) return Promise.resolve([]);
    return this.ds.getRepository(FreeAmmoniaResult).findBy({ waterTestId: In(testIds) });
  }
  resultForTest(testId: string): Promise<FreeAmmoniaResult | null> {
    return this.ds.getRepository(FreeAmmoniaResult).findOneBy({ waterTestId: testId });
  }
  latestResult(unitId: string): Promise<FreeAmmoniaResult | null> {
    return this.ds.getRepository(FreeAmmoniaResult).findOne({ where: { unitId, status: 'ok' }, order: { sampledAt: 'DESC' } });
  }
  /** The newest computed result of each unit (one DISTINCT ON over the (unit, sampled_at) index). */
  async latestResultsOf(unitIds: string[]): Promise<FreeAmmoniaResult[]> {
    if (!unitIds.length) return [];
    const ids = (await this.ds.query(
      `SELECT DISTINCT ON (unit_id) id FROM free_ammonia_results WHERE unit_id = ANY($1::uuid[]) ORDER BY unit_id, sampled_at DESC`,
      [unitIds],
    )) as Array<{ id: string }>;
    return ids.length ? this.ds.getRepository(FreeAmmoniaResult).findBy({ id: In(ids.map((r) => r.id)) }) : [];
  }
  listResults(unitId: string, limit: number): Promise<FreeAmmoniaResult[]> {
    return this.ds.getRepository(FreeAmmoniaResult).find({ where: { unitId }, order: { sampledAt: 'DESC' }, take: limit });
  }
  latestTestOf(unitId: string, analyte: string): Promise<WaterTest | null> {
    return this.ds.getRepository(WaterTest).findOne({ where: { unitId, analyte }, order: { sampledAt: 'DESC' } });
  }
  probesOfUnit(unitId: string): Promise<Probe[]> {
    return this.ds.getRepository(Probe).findBy({ unitId });
  }

  /** The good reading nearest before (or at) and after `at` within the window, across the unit's probes. */
  async readingsAround(probeIds: string[], quantity: string, at: Date, windowMs: number): Promise<{ before: NearReading | null; after: NearReading | null }> {
    if (!probeIds.length) return { before: null, after: null };
    const q = (op: '<=' | '>', order: 'DESC' | 'ASC', bound: Date) =>
      this.ds.query(
        `SELECT probe_id AS "probeId", at, value FROM readings
         WHERE probe_id = ANY($1::uuid[]) AND quantity = $2 AND quality = 'good'
           AND at ${op} $3 AND at ${op === '<=' ? '>=' : '<='} $4
         ORDER BY at ${order} LIMIT 1`,
        [probeIds, quantity, at.toISOString(), bound.toISOString()],
      ) as Promise<NearReading[]>;
    const [before, after] = await Promise.all([
      q('<=', 'DESC', new Date(at.getTime() - windowMs)),
      q('>', 'ASC', new Date(at.getTime() + windowMs)),
    ]);
    const norm = (r: NearReading | undefined) => (r ? { probeId: r.probeId, at: new Date(r.at), value: Number(r.value) } : null);
    return { before: norm(before[0]), after: norm(after[0]) };
  }

  /** Mean pH and temperature per local hour of day over a period: the unit's diurnal curve. */
  async hourlyCurve(probeIds: string[], from: Date, to: Date, timeZone: string): Promise<Array<{ hour: number; quantity: string; avg: number; n: number }>> {
    if (!probeIds.length) return [];
    const rows = (await this.ds.query(
      `SELECT extract(hour FROM at AT TIME ZONE $4)::int AS hour, quantity, avg(value) AS avg, count(*)::int AS n
       FROM readings
       WHERE probe_id = ANY($1::uuid[]) AND quantity IN ('ph', 'water_temperature') AND quality = 'good' AND at >= $2 AND at < $3
       GROUP BY 1, 2`,
      [probeIds, from.toISOString(), to.toISOString(), timeZone],
    )) as Array<{ hour: number; quantity: string; avg: string | number; n: number }>;
    return rows.map((r) => ({ hour: Number(r.hour), quantity: r.quantity, avg: Number(r.avg), n: Number(r.n) }));
  }

  treatmentsBetween(unitId: string, from: Date, to: Date): Promise<Treatment[]> {
    return this.ds.getRepository(Treatment).find({ where: { unitId, startsAt: Between(from, to) }, order: { startsAt: 'DESC' } });
  }

  /** Stores the result for a test version; recomputing the same test replaces its one row. */
  async upsertResult(row: Omit<FreeAmmoniaResult, 'id'>): Promise<FreeAmmoniaResult> {
    await this.ds
      .createQueryBuilder()
      .insert()
      .into(FreeAmmoniaResult)
      .values(row as never)
      .orUpdate(
        ['status', 'tan_mg_l', 'nh3_n_mg_l', 'nh3_mg_l', 'fraction', 'p_ka', 'method', 'ph_scale', 'ph', 'temperature_c', 'salinity_ppt', 'provenance', 'flags', 'forecast_peak', 'test_version', 'computed_at', 'sampled_at', 'unit_id'],
        ['water_test_id'],
      )
      .execute();
    const stored = await this.resultForTest(row.waterTestId);
    if (!stored) throw new Error('result vanished after upsert');
    return stored;
  }
}
