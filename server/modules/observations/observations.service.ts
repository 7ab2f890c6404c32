import { dieOffKinds, type CreateObservation } from '../../../shared/schemas/treatments.schema';
import type { Observation } from '../../db/entities';
import { notFound } from '../../http/errors';
import type { Queues } from '../../queues';
import type { LiveService } from '../live/live.service';
import type { ObservationsRepository } from './observations.repository';

const CLOSE_WATCH_DAYS = 7;

export class ObservationsService {
  constructor(
    private readonly repo: ObservationsRepository,
    private readonly queues: Queues,
    private readonly live: LiveService,
  ) {}

  /** Logs an observation; a die-off sign puts the unit on closer watch (daily tests) for a week. */
  async create(farmId: string, unitId: string, input: CreateObservation, userId: string | null): Promise<{ observation: Observation; closeWatchUntil: Date | null; created: boolean }> {
    const unit = await this.repo.findUnit(farmId, unitId);
    if (!unit) throw notFound('Unit');
    if (input.clientId) {
      const existing = await this.repo.findByClientId(farmId, input.clientId);
      if (existing) return { observation: existing, closeWatchUntil: unit.closeWatchUntil, created: false };
    }
    const observedAt = input.observedAt ? new Date(input.observedAt) : new Date();
    const observation = await this.repo.save({
      farmId,
      unitId,
      clientId: input.clientId ?? null,
      kind: input.kind,
      detail: input.detail ?? null,
      count: input.count ?? null,
      photoPath: null,
      observedAt,
      createdById: userId,
    });
    let closeWatchUntil = unit.closeWatchUntil;
    if (dieOffKinds.includes(input.kind)) {
      closeWatchUntil = await this.repo.extendCloseWatch(unitId, new Date(observedAt.getTime() + CLOSE_WATCH_DAYS * 86_400_000));
      await this.queues.add('evaluateUnit', { farmId, unitId, reason: 'observation' }, { deduplication: { id: `unit:${unitId}`, keepLastIfActive: true } });
      await this.queues.add('recommendFeed', { farmId, unitId }, { deduplication: { id: `feed:${unitId}`, keepLastIfActive: true } });
    }
    this.live.notify({ type: 'task', farmId, unitId, data: { observation: input.kind } });
    return { observation, closeWatchUntil, created: true };
  }

  async list(farmId: string, unitId: string): Promise<Observation[]> {
    if (!(await this.repo.findUnit(farmId, unitId))) throw notFound('Unit');
    return this.repo.list(unitId);
  }
}
