import type { CreateTreatment, Withdrawal } from '../../../shared/schemas/treatments.schema';
import type { Treatment } from '../../db/entities';
import { notFound } from '../../http/errors';
import type { Queues } from '../../queues';
import type { AuditSink } from '../water-tests/water-tests.service';
import type { TreatmentsRepository } from './treatments.repository';
import { dayBasedEnd, degreeDayEnd } from './withdrawal';

const none: Withdrawal = { inWithdrawal: false, endsAt: null, basis: 'none', estimate: null, degreeDaysSoFar: null, treatmentId: null, reason: null };

export class TreatmentsService {
  constructor(
    private readonly repo: TreatmentsRepository,
    private readonly queues: Queues,
    private readonly audit: AuditSink,
  ) {}

  async create(farmId: string, unitId: string, input: CreateTreatment, userId: string | null): Promise<{ treatment: Treatment; withdrawal: Withdrawal }> {
    const unit = await this.repo.findUnit(farmId, unitId);
    if (!unit) throw notFound('Unit');
    const startsAt = new Date(input.startsAt);
    const endsAt = input.endsAt ? new Date(input.endsAt) : null;
    const treatment = await this.repo.save({
      farmId,
      unitId,
      product: input.product,
      productName: input.productName ?? null,
      dose: input.dose ?? null,
      doseUnit: input.doseUnit ?? null,
      startsAt,
      endsAt,
      withdrawalDays: input.withdrawalDays ?? null,
      withdrawalDegreeDays: input.withdrawalDegreeDays ?? null,
      withdrawalEndsAt: input.withdrawalDays != null ? dayBasedEnd(startsAt, endsAt, input.withdrawalDays) : null,
      note: input.note ?? null,
      createdById: userId,
    });
    await this.audit.record({ farmId, actorId: userId, action: 'treatment.logged', entity: 'treatment', entityId: treatment.id, before: null, after: { ...input } });
    await this.queues.add('evaluateUnit', { farmId, unitId, reason: 'treatment' }, { deduplication: { id: `unit:${unitId}`, keepLastIfActive: true } });
    await this.queues.add('recommendFeed', { farmId, unitId }, { deduplication: { id: `feed:${unitId}`, keepLastIfActive: true } });
    return { treatment, withdrawal: await this.withdrawalOf(treatment) };
  }

  /** When the withdrawal of one treatment ends; degree-days come from the unit's logged daily mean temperatures. */
  async withdrawalOf(t: Treatment, now = new Date()): Promise<Withdrawal> {
    const label = `${t.productName ?? t.product.replace('_', ' ')} from ${t.startsAt.toISOString().slice(0, 10)}`;
    if (t.withdrawalDays != null) {
      const endsAt = t.withdrawalEndsAt ?? dayBasedEnd(t.startsAt, t.endsAt, t.withdrawalDays);
      return { inWithdrawal: endsAt > now, endsAt: endsAt.toISOString(), basis: 'days', estimate: 'fixed', degreeDaysSoFar: null, treatmentId: t.id, reason: `Withdrawal after ${label}: ${t.withdrawalDays} days` };
    }
    if (t.withdrawalDegreeDays != null) {
      const farm = await this.repo.findFarm(t.farmId);
      const timeZone = farm?.timeZone ?? 'UTC';
      const treatmentEnd = t.endsAt ?? t.startsAt;
      const dailyMeans = await this.repo.dailyMeanTemperatures(t.unitId, treatmentEnd, timeZone);
      const r = degreeDayEnd({ treatmentEnd, degreeDays: t.withdrawalDegreeDays, dailyMeans, timeZone, now });
      // Without an end in sight (no temperatures logged) the unit stays in withdrawal: refuse rather than guess.
      const inWithdrawal = r.estimate === 'projected' || (r.endsAt !== null && r.endsAt > now);
      return {
        inWithdrawal,
        endsAt: r.endsAt?.toISOString() ?? null,
        basis: 'degree_days',
        estimate: r.estimate,
        degreeDaysSoFar: Math.round(r.degreeDaysSoFar * 10) / 10,
        treatmentId: t.id,
        reason: `Withdrawal after ${label}: ${t.withdrawalDegreeDays} °C·days (${Math.round(r.degreeDaysSoFar)} so far)`,
      };
    }
    return none;
  }

  /** Whether the unit is in a withdrawal period now (harvest and transfer are refused while it is). */
  async withdrawalStatus(farmId: string, unitId: string, at = new Date()): Promise<Withdrawal> {
    let latest: Withdrawal = none;
    for (const t of await this.repo.listForUnit(unitId)) {
      if (t.farmId !== farmId || (t.withdrawalDays == null && t.withdrawalDegreeDays == null)) continue;
      const w = await this.withdrawalOf(t, at);
      if (w.inWithdrawal && (!latest.inWithdrawal || (w.endsAt ?? '9999') > (latest.endsAt ?? '9999'))) latest = w;
    }
    return latest;
  }

  async list(farmId: string, unitId: string): Promise<Array<{ treatment: Treatment; withdrawal: Withdrawal }>> {
    const unit = await this.repo.findUnit(farmId, unitId);
    if (!unit) throw notFound('Unit');
    const rows = await this.repo.listForUnit(unitId);
    return Promise.all(rows.map(async (treatment) => ({ treatment, withdrawal: await this.withdrawalOf(treatment) })));
  }

  async listFarm(farmId: string): Promise<Array<{ treatment: Treatment; withdrawal: Withdrawal }>> {
    const rows = await this.repo.listForFarm(farmId);
    return Promise.all(rows.map(async (treatment) => ({ treatment, withdrawal: await this.withdrawalOf(treatment) })));
  }

  /** Treatments on a unit that started in [from, to] (kit interference, feed rules). */
  async recent(farmId: string, unitId: string, sinceMs: number, now = new Date()): Promise<Treatment[]> {
    return (await this.repo.listForUnit(unitId)).filter((t) => t.farmId === farmId && t.startsAt.getTime() >= now.getTime() - sinceMs && t.startsAt <= now);
  }
}
