import { addDays, daysBetween, localDay, zonedTime } from '../../../shared/farm-time';
import { RECORDS_DEFAULT_RANGE_DAYS, RECORDS_MAX_RANGE_DAYS, type RecordsQuery } from '../../../shared/schemas/records.schema';
import { notFound, validationError } from '../../http/errors';
import type { Farm } from '../../db/entities';
import type { FeedingRecordRow, MortalityRecordRow, Period, RecordsRepository, RecordUnit, TestRecordRow, TreatmentRecordRow } from './records.repository';

export type RecordsBook = {
  farm: Farm;
  period: Period;
  units: RecordUnit[];
  tests: TestRecordRow[];
  treatments: TreatmentRecordRow[];
  mortalities: MortalityRecordRow[];
  feeding: FeedingRecordRow[];
  generatedAt: Date;
};

const DAY = /^\d{4}-\d{2}-\d{2}$/;

/** The period in instants and farm-local days: a day bound covers the whole local day (`to` inclusive). */
export function resolvePeriod(q: Pick<RecordsQuery, 'from' | 'to'>, timeZone: string, now = new Date()): Period {
  const startOf = (day: string) => zonedTime(day, 0, 0, timeZone);
  const to = q.to ? (DAY.test(q.to) ? startOf(addDays(q.to, 1)) : new Date(q.to)) : startOf(addDays(localDay(now, timeZone), 1));
  const toDay = localDay(new Date(to.getTime() - 1), timeZone);
  const from = q.from ? (DAY.test(q.from) ? startOf(q.from) : new Date(q.from)) : startOf(addDays(toDay, 1 - RECORDS_DEFAULT_RANGE_DAYS));
  const fromDay = localDay(from, timeZone);
  if (from.getTime() >= to.getTime()) throw validationError({ fieldErrors: { from: ['must be before `to`'] } }, 'The period is empty.');
  if (daysBetween(fromDay, toDay) + 1 > RECORDS_MAX_RANGE_DAYS) {
    throw validationError({ fieldErrors: { from: [`the period may span at most ${RECORDS_MAX_RANGE_DAYS} days`] } }, 'The period is too long.');
  }
  return { from, to, fromDay, toDay };
}

export class RecordsService {
  constructor(private readonly repo: RecordsRepository) {}

  /** Everything an inspector asks for about one farm and period, read in one go. */
  async book(farmId: string, q: RecordsQuery): Promise<RecordsBook> {
    const farm = await this.repo.findFarm(farmId);
    if (!farm) throw notFound('Farm');
    const allUnits = await this.repo.units(farmId);
    if (q.unitId && !allUnits.some((u) => u.id === q.unitId)) throw notFound('Unit');
    const units = q.unitId ? allUnits.filter((u) => u.id === q.unitId) : allUnits;
    const period = resolvePeriod(q, farm.timeZone);
    const unitId = q.unitId ?? null;
    const [tests, treatments, mortalities, feeding] = await Promise.all([
      this.repo.tests(farmId, period, unitId),
      this.repo.treatments(farmId, period, unitId),
      this.repo.mortalities(farmId, period, unitId),
      this.repo.feeding(farmId, period, unitId),
    ]);
    return { farm, period, units, tests, treatments, mortalities, feeding, generatedAt: new Date() };
  }
}
