import { localDay, zonedTime } from '../../../shared/farm-time';
import type { CreateFeeding } from '../../../shared/schemas/feed.schema';
import type { FeedingRecord } from '../../db/entities';
import { badRequest } from '../../http/errors';
import type { LiveService } from '../live/live.service';
import type { AuditRecorder, FarmDirectory, FeedLedger, UnitDirectory } from '../stock/stock.service';
import type { FeedRepository } from './feed.repository';

/** Fed amounts may differ from the approved ration by this share before a reason is required. */
export const FEEDING_TOLERANCE = 0.1;

/** What the hands actually fed (or withheld, and why): one record per unit and farm-local day. */
export class FeedingsService implements FeedLedger {
  constructor(
    private readonly repo: FeedRepository,
    private readonly farms: FarmDirectory,
    private readonly units: UnitDirectory,
    private readonly live: LiveService,
    private readonly audit: AuditRecorder,
  ) {}

  /**
   * Records the day's feeding of a unit; a second record for the same day replaces the first (an
   * offline resend or a correction), audited with before and after. A reason is required when feed
   * was withheld or the amount differs from the approved ration (the recommended one while the
   * planner has not decided) by more than 10 %.
   */
  async record(farmId: string, unitId: string, input: CreateFeeding, actorId: string | null): Promise<{ feeding: FeedingRecord; replaced: boolean }> {
    await this.units.require(farmId, unitId);
    const timeZone = await this.farms.timeZone(farmId);
    const today = localDay(new Date(), timeZone);
    if (input.day > today) throw badRequest('That day has not come yet on this farm.', { fieldErrors: { day: [`after today (${today})`] } }, 'validation_failed');
    const rec = await this.repo.recommendationOf(unitId, input.day);
    const target = rec ? (rec.status === 'pending' ? rec.recommendedKg : rec.approvedKg) : null;
    const reason = input.reason?.trim() || null;
    if (!reason && target !== null) {
      const differs = target === 0 ? input.fedKg > 0 : Math.abs(input.fedKg - target) > FEEDING_TOLERANCE * target;
      if (differs) {
        const which = rec?.status === 'pending' ? 'recommended' : 'approved';
        throw badRequest(
          `${input.fedKg} kg differs from the ${which} ${target} kg by more than 10 %: say why.`,
          { fieldErrors: { reason: [`required when the amount differs from the ${which} ration by more than 10 %`] } },
          'validation_failed',
        );
      }
    }
    // Without a time, a feeding of a past day counts at its local noon, today's at the moment it is recorded.
    const fedAt = input.fedAt ? new Date(input.fedAt) : input.day === today ? new Date() : zonedTime(input.day, 12, 0, timeZone);
    const existing = await this.repo.findFeeding(unitId, input.day);
    const values = { fedKg: input.fedKg, withheld: input.withheld, reason, response: input.response ?? null, fedAt, recordedById: actorId };
    const before = existing ? snapshot(existing) : null;
    const feeding = await this.repo.saveFeeding(existing ? Object.assign(existing, values) : { farmId, unitId, day: input.day, ...values });
    await this.audit.record({
      farmId,
      actorId,
      action: existing ? 'feeding.corrected' : 'feeding.recorded',
      entity: 'feeding_record',
      entityId: feeding.id,
      before,
      after: snapshot(feeding),
    });
    this.live.notify({ type: 'recommendation', farmId, unitId, data: { day: input.day, fedKg: feeding.fedKg, withheld: feeding.withheld } });
    return { feeding, replaced: Boolean(existing) };
  }

  async list(farmId: string, unitId: string, q: { from?: string | undefined; to?: string | undefined }): Promise<FeedingRecord[]> {
    await this.units.require(farmId, unitId);
    return this.repo.feedingsOfUnit(unitId, q.from ?? '1970-01-01', q.to ?? '9999-12-31');
  }

  forDay(farmId: string, day: string): Promise<FeedingRecord[]> {
    return this.repo.feedingsOfDay(farmId, day);
  }

  async fedBetween(unitId: string, from: Date, to: Date): Promise<Array<{ fedAt: Date; fedKg: number }>> {
    return (await this.repo.feedingsBetween(unitId, from, to)).map((f) => ({ fedAt: f.fedAt, fedKg: f.fedKg }));
  }
}

function snapshot(f: FeedingRecord): Record<string, unknown> {
  return { day: f.day, fedKg: f.fedKg, withheld: f.withheld, reason: f.reason, response: f.response, fedAt: f.fedAt.toISOString() };
}
