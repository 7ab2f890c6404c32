import { randomBytes } from 'node:crypto';
import { isValidProbeKey, readingsTopic } from '../../../shared/mqtt/topics';
import type { Quantity } from '../../../shared/schemas/mqtt.schema';
import type {
  CalibrationDto,
  CreateCalibrationRequest,
  CreateMaintenanceWindowRequest,
  CreateProbeRequest,
  IngestStatusResponse,
  MaintenanceWindowDto,
  ProbeCredentialResponse,
  ProbeDto,
  UpdateProbeRequest,
} from '../../../shared/schemas/probes.schema';
import type { Probe } from '../../db/entities';
import { notFound, validationError } from '../../http/errors';
import type { IngestCounters } from '../../ingest/broker';
import type { Logger } from '../../lib/logger';
import { changedFields, type AuditService } from '../audit/audit.service';
import type { FarmsService } from '../farms/farms.service';
import type { UnitsService } from '../units/units.service';
import { assessCalibration } from './probe-calibration';
import type { ProbeCredentialFileStore } from './probe-credential-file';
import type { ProbeHealthService } from './probe-health.service';
import { hashProbeSecret, newProbeSecret } from './probe-secrets';
import { presentCalibration, presentProbe, presentProbeFields, presentWindow } from './probes.presenter';
import type { ProbesRepository } from './probes.repository';

/** What the probes module needs of the MQTT broker (server/ingest/broker.ts BrokerHandle); absent when none runs. */
export type ProbeConnections = { disconnectProbe(probeKey: string): void; counters?(): IngestCounters };

const DAY = 86_400_000;
const KEY_ALPHABET = 'abcdefghijkmnpqrstuvwxyz23456789'; // no 0/o, 1/l: keys are read off labels

/** Short farm prefix for probe keys: the initials of a hyphenated slug ('harrow-bend' → 'hb'), else its first 4 characters. */
export function farmKeyPrefix(slug: string): string {
  const parts = slug.split('-').filter(Boolean);
  const prefix =
    parts.length > 1
      ? parts
          .map((p) => p[0])
          .join('')
          .slice(0, 6)
      : slug.slice(0, 4);
  return prefix.replace(/[^a-z0-9]/g, '') || 'gw';
}

/** `<farm prefix>-<8 random characters>`, valid for shared/mqtt/topics.ts isValidProbeKey. */
export function newProbeKey(slug: string): string {
  const bytes = randomBytes(8);
  const tail = [...bytes].map((b) => KEY_ALPHABET[b % KEY_ALPHABET.length]).join('');
  return `${farmKeyPrefix(slug)}-${tail}`;
}

/** Quantities a calibration may name for a probe: its own, and salinity where it derives it from conductivity. */
function calibratable(probe: Probe): Set<string> {
  const set = new Set<string>(probe.quantities);
  if (set.has('conductivity') || set.has('specific_conductance')) set.add('salinity');
  return set;
}

export class ProbesService {
  constructor(
    private readonly repo: ProbesRepository,
    private readonly health: ProbeHealthService,
    private readonly audit: AuditService,
    private readonly farms: FarmsService,
    private readonly units: UnitsService,
    private readonly credentialFile: ProbeCredentialFileStore | null,
    private readonly logger: Logger,
  ) {}

  async list(farmId: string, filter: { unitId?: string | undefined } = {}): Promise<ProbeDto[]> {
    const probes = await this.repo.listByFarm(farmId, filter);
    const health = await this.health.evaluateProbes(farmId, probes);
    return probes.map((p, i) => presentProbe(p, health[i]!));
  }

  /** The probe entity, or 404 when it is not on this farm. */
  async require(farmId: string, probeId: string): Promise<Probe> {
    const probe = await this.repo.find(farmId, probeId);
    if (!probe) throw notFound('Probe');
    return probe;
  }

  async get(farmId: string, probeId: string): Promise<ProbeDto> {
    return this.present(farmId, await this.require(farmId, probeId));
  }

  /** Registers a probe with a new key and secret; the secret is in this answer only. Audited (without the secret). */
  async create(farmId: string, input: CreateProbeRequest, actorId: string | null): Promise<ProbeCredentialResponse> {
    if (input.unitId) await this.units.require(farmId, input.unitId);
    const farm = await this.farms.get(farmId, 'admin');
    const secret = newProbeSecret();
    const now = new Date();
    let saved: Probe | 'key_taken' = 'key_taken';
    // A key collision is astronomically rare; retry a few times rather than fail.
    for (let attempt = 0; attempt < 5 && saved === 'key_taken'; attempt++) {
      const probeKey = newProbeKey(farm.slug);
      if (!isValidProbeKey(probeKey)) continue;
      saved = await this.repo.insert({
        farmId,
        unitId: input.unitId,
        probeKey,
        label: input.label,
        model: input.model ?? null,
        quantities: input.quantities,
        intervalSeconds: input.intervalSeconds,
        secretHash: hashProbeSecret(secret),
        secretRotatedAt: now,
        active: true,
      });
    }
    if (saved === 'key_taken') throw new Error('could not generate a unique probe key');
    const probe = saved;
    await this.audit.record({
      farmId,
      actorId,
      action: 'probe.created',
      entity: 'probe',
      entityId: probe.id,
      before: null,
      after: presentProbeFields(probe),
    });
    await this.writeCredential(probe, secret);
    return {
      probe: await this.present(farmId, probe),
      credential: { username: probe.probeKey, secret, topic: readingsTopic(probe.probeKey), issuedAt: now.toISOString() },
    };
  }

  /**
   * Issues a new secret: the old one is refused from now on (the broker checks the stored hash on every
   * connect, and the probe's live connection is closed). Audited (without the secret).
   */
  async rotateCredential(
    farmId: string,
    probeId: string,
    actorId: string | null,
    broker?: ProbeConnections,
  ): Promise<ProbeCredentialResponse> {
    const probe = await this.require(farmId, probeId);
    const secret = newProbeSecret();
    const before = probe.secretRotatedAt.toISOString();
    probe.secretHash = hashProbeSecret(secret);
    probe.secretRotatedAt = new Date();
    const saved = await this.repo.save(probe);
    broker?.disconnectProbe(saved.probeKey);
    await this.audit.record({
      farmId,
      actorId,
      action: 'probe.credential_rotated',
      entity: 'probe',
      entityId: probeId,
      before: { secretRotatedAt: before },
      after: { secretRotatedAt: saved.secretRotatedAt.toISOString() },
    });
    await this.writeCredential(saved, secret);
    return {
      probe: await this.present(farmId, saved),
      credential: { username: saved.probeKey, secret, topic: readingsTopic(saved.probeKey), issuedAt: saved.secretRotatedAt.toISOString() },
    };
  }

  /** Label, unit, quantities, interval, model, active. Moving or deactivating a probe closes its connection. Audited. */
  async update(
    farmId: string,
    probeId: string,
    patch: UpdateProbeRequest,
    actorId: string | null,
    broker?: ProbeConnections,
  ): Promise<ProbeDto> {
    const probe = await this.require(farmId, probeId);
    if (patch.unitId) await this.units.require(farmId, patch.unitId);
    const before = presentProbeFields(probe);
    Object.assign(probe, patch);
    const saved = await this.repo.save(probe);
    const after = presentProbeFields(saved);
    // The broker caches the unit and the active flag per connection: make the probe connect again.
    if (before.unitId !== after.unitId || before.active !== after.active) broker?.disconnectProbe(saved.probeKey);
    if (!after.active && before.active) await this.removeCredential(saved.probeKey);
    const diff = changedFields(before, after);
    if (Object.keys(diff.after).length) {
      await this.audit.record({
        farmId,
        actorId,
        action: 'probe.updated',
        entity: 'probe',
        entityId: probeId,
        before: diff.before,
        after: diff.after,
      });
    }
    return this.present(farmId, saved);
  }

  /** Deactivates the probe: it can no longer connect, and it leaves the health checks. */
  deactivate(farmId: string, probeId: string, actorId: string | null, broker?: ProbeConnections): Promise<ProbeDto> {
    return this.update(farmId, probeId, { active: false }, actorId, broker);
  }

  async addCalibration(farmId: string, probeId: string, input: CreateCalibrationRequest, actorId: string | null): Promise<CalibrationDto> {
    const probe = await this.require(farmId, probeId);
    if (!calibratable(probe).has(input.quantity)) {
      throw validationError({ formErrors: [], fieldErrors: { quantity: [`this probe does not measure ${input.quantity}`] } });
    }
    const outcome = assessCalibration(input);
    const row = await this.repo.insertCalibration({
      probeId,
      quantity: input.quantity,
      performedAt: outcome.performedAt,
      performedById: actorId,
      method: outcome.method,
      details: outcome.details,
      passed: outcome.passed,
      nextDueAt: outcome.nextDueAt,
      note: input.note ?? null,
    });
    const dto = presentCalibration(row);
    await this.audit.record({ farmId, actorId, action: 'probe.calibrated', entity: 'probe', entityId: probeId, before: null, after: dto });
    return dto;
  }

  async listCalibrations(farmId: string, probeId: string): Promise<CalibrationDto[]> {
    await this.require(farmId, probeId);
    return (await this.repo.listCalibrations(probeId)).map(presentCalibration);
  }

  async addWindow(
    farmId: string,
    probeId: string,
    input: CreateMaintenanceWindowRequest,
    actorId: string | null,
  ): Promise<MaintenanceWindowDto> {
    await this.require(farmId, probeId);
    const row = await this.repo.insertWindow({
      probeId,
      startsAt: new Date(input.startsAt),
      endsAt: new Date(input.endsAt),
      reason: input.reason,
      createdById: actorId,
    });
    const dto = presentWindow(row);
    await this.audit.record({
      farmId,
      actorId,
      action: 'probe.maintenance_scheduled',
      entity: 'probe',
      entityId: probeId,
      before: null,
      after: dto,
    });
    return dto;
  }

  /** Windows not yet over and those that ended in the last 30 days, newest first. */
  async listWindows(farmId: string, probeId: string): Promise<MaintenanceWindowDto[]> {
    await this.require(farmId, probeId);
    const now = new Date();
    return (await this.repo.listWindows(probeId, new Date(now.getTime() - 30 * DAY))).map((w) => presentWindow(w, now));
  }

  /** Cancels a window; idempotent (nothing to do when it is already gone). */
  async deleteWindow(farmId: string, probeId: string, windowId: string, actorId: string | null): Promise<void> {
    await this.require(farmId, probeId);
    const w = await this.repo.findWindow(probeId, windowId);
    // Already gone (cancelled twice, or never existed): the outcome the caller wants holds.
    if (!w) return;
    await this.repo.deleteWindow(windowId);
    await this.audit.record({
      farmId,
      actorId,
      action: 'probe.maintenance_cancelled',
      entity: 'probe',
      entityId: probeId,
      before: presentWindow(w),
      after: null,
    });
  }

  /** The broker's process-wide counters and this farm's stored reject counts. */
  async ingestStatus(farmId: string, broker?: ProbeConnections): Promise<IngestStatusResponse> {
    const rejects = await this.repo.rejectsOfFarm(farmId);
    return {
      broker: broker?.counters ? broker.counters() : null,
      rejects: rejects.map((r) => ({
        probeId: r.probeId,
        probeKey: r.probeKey,
        reason: r.reason,
        count: r.count,
        lastAt: r.lastAt.toISOString(),
        lastDetail: r.lastDetail,
      })),
    };
  }

  private async present(farmId: string, probe: Probe): Promise<ProbeDto> {
    const [health] = await this.health.evaluateProbes(farmId, [probe]);
    return presentProbe(probe, health!);
  }

  /** Keeps the simulator's credential file in step (when configured). A failure is logged, never fatal: the secret is in the answer. */
  private async writeCredential(probe: Probe, secret: string): Promise<void> {
    if (!this.credentialFile) return;
    try {
      if (!probe.unitId || !probe.active) return await this.credentialFile.remove(probe.probeKey);
      const unit = await this.units.require(probe.farmId, probe.unitId);
      const [farm, designFlowLpm] = await Promise.all([this.farms.get(probe.farmId, 'admin'), this.units.designFlowLpm(unit.id)]);
      await this.credentialFile.upsert({
        farmTimeZone: farm.timeZone,
        ...(farm.latitude !== null && farm.longitude !== null ? { latitude: farm.latitude, longitude: farm.longitude } : {}),
        ...(unit.volumeM3 && unit.areaM2 ? { depthM: Math.round((unit.volumeM3 / unit.areaM2) * 100) / 100 } : {}),
        ...(designFlowLpm ? { designFlowLpm } : {}),
        probeKey: probe.probeKey,
        secret,
        farmSlug: farm.slug,
        unitCode: unit.code,
        unitKind: unit.kind,
        waterType: unit.waterType,
        salinityPpt: unit.defaultSalinityPpt,
        species: unit.species ?? 'unknown',
        quantities: probe.quantities as Quantity[],
        intervalSeconds: probe.intervalSeconds,
      });
    } catch (err) {
      this.logger.error({ err, probeKey: probe.probeKey }, 'could not update the probe credential file');
    }
  }

  private async removeCredential(probeKey: string): Promise<void> {
    if (!this.credentialFile) return;
    await this.credentialFile
      .remove(probeKey)
      .catch((err: unknown) => this.logger.error({ err, probeKey }, 'could not update the probe credential file'));
  }
}
