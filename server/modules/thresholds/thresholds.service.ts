import type { ThresholdProfileDto, UpdateThresholdProfileRequest } from '../../../shared/schemas/thresholds.schema';
import type { ThresholdProfile, ThresholdRule } from '../../db/entities';
import { notFound } from '../../http/errors';
import type { Logger } from '../../lib/logger';
import type { Queues } from '../../queues';
import { presentProfile, presentRule } from './thresholds.presenter';
import type { ThresholdsRepository } from './thresholds.repository';

/** Where audit entries go: the audit module's AuditService (or the interim sink) fits this. */
export type AuditPort = {
  record(entry: {
    farmId: string | null;
    actorId: string | null;
    action: string;
    entity: string;
    entityId: string | null;
    before: Record<string, unknown> | null;
    after: Record<string, unknown> | null;
  }): Promise<unknown>;
};

export class ThresholdsService {
  constructor(
    private readonly repo: ThresholdsRepository,
    private readonly audit: AuditPort,
    private readonly queues: Queues,
    private readonly logger: Logger,
  ) {}

  async list(farmId: string): Promise<ThresholdProfileDto[]> {
    const [profiles, units] = await Promise.all([this.repo.list(farmId), this.repo.unitsByProfile(farmId)]);
    return profiles.map((p) => presentProfile(p, units.get(p.id) ?? []));
  }

  async get(farmId: string, profileId: string): Promise<ThresholdProfileDto> {
    const p = await this.repo.find(farmId, profileId);
    if (!p) throw notFound('Threshold profile');
    return presentProfile(p, (await this.repo.unitsByProfile(farmId)).get(p.id) ?? []);
  }

  /** Profiles by id (the unit evaluation loads a farm's profiles in one go). */
  byIds(ids: string[]): Promise<ThresholdProfile[]> {
    return this.repo.byIds([...new Set(ids)]);
  }

  /**
   * Replaces a profile's rules (and optionally its name), audited with before and after, then queues a
   * re-evaluation of every unit that uses it so open alerts follow the new limits.
   */
  async update(farmId: string, profileId: string, body: UpdateThresholdProfileRequest, actorId: string | null): Promise<ThresholdProfileDto> {
    const p = await this.repo.find(farmId, profileId);
    if (!p) throw notFound('Threshold profile');
    const before = { name: p.name, rules: p.rules.map(presentRule) };
    p.rules = body.rules.map((r): ThresholdRule => ({
      metric: r.metric,
      watch: r.watch,
      act: r.act,
      basis: r.basis,
      source: r.source,
      ...(r.bySalinity ? { bySalinity: r.bySalinity } : {}),
    }));
    if (body.name) p.name = body.name;
    const saved = await this.repo.save(p);
    await this.audit.record({
      farmId,
      actorId,
      action: 'threshold_profile.updated',
      entity: 'threshold_profile',
      entityId: p.id,
      before,
      after: { name: saved.name, rules: saved.rules.map(presentRule), ...(body.reason ? { reason: body.reason } : {}) },
    });
    const unitIds = (await this.repo.unitsByProfile(farmId)).get(p.id) ?? [];
    for (const unitId of unitIds) {
      await this.queues
        .add('evaluateUnit', { farmId, unitId, reason: 'thresholds' }, { deduplication: { id: `unit:${unitId}`, keepLastIfActive: true } })
        .catch((err: unknown) => this.logger.warn({ err, unitId }, 're-evaluation not queued'));
    }
    return presentProfile(saved, unitIds);
  }
}
