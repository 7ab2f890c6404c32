import { randomBytes } from 'node:crypto';
import QRCode from 'qrcode';
import type { Role } from '../../../shared/schemas/auth.schema';
import type {
  CreateFlowRequest,
  CreateUnitRequest,
  FlowMeasurementDto,
  LabelResolveResponse,
  LatestFlow,
  UnitDto,
  UnitLabelResponse,
  UpdateUnitRequest,
} from '../../../shared/schemas/units.schema';
import type { CultureUnit } from '../../db/entities';
import { conflict, forbidden, notFound, validationError } from '../../http/errors';
import { changedFields, type AuditService } from '../audit/audit.service';
import type { ReadingsService } from '../readings/readings.service';
import { polygonAreaM2 } from './unit-geometry';
import { presentFlow, presentLatestFlow, presentUnit } from './units.presenter';
import type { UnitsRepository } from './units.repository';

/** The flow that counts for a unit now, whichever source is newest. */
export type LatestFlowValue = {
  flowLpm: number;
  at: Date;
  source: 'probe' | 'manual' | 'design';
  probeId: string | null;
  measurementId: string | null;
};

/** An id for the printed QR label: 12 URL-safe characters, unguessable, unrelated to the unit's other ids. */
const newLabelId = () => randomBytes(9).toString('base64url');

const codeTaken = (code: string) =>
  conflict(`This farm already has a unit with code ${code}.`, { fieldErrors: { code: ['already used on this farm'] } }, 'code_taken');

export class UnitsService {
  constructor(
    private readonly repo: UnitsRepository,
    private readonly audit: AuditService,
    private readonly readings: ReadingsService,
    private readonly options: { publicUrl: string },
  ) {}

  async list(farmId: string, filter: { kind?: CultureUnit['kind']; state?: CultureUnit['state'] } = {}): Promise<UnitDto[]> {
    return (await this.repo.list(farmId, filter)).map(presentUnit);
  }

  /** The unit entity, or 404 when it is not on this farm. Other modules use this to check a unit id. */
  async require(farmId: string, unitId: string): Promise<CultureUnit> {
    const unit = await this.repo.find(farmId, unitId);
    if (!unit) throw notFound('Unit');
    return unit;
  }

  async get(farmId: string, unitId: string): Promise<UnitDto> {
    return presentUnit(await this.require(farmId, unitId));
  }

  async create(farmId: string, input: CreateUnitRequest, actorId: string | null): Promise<UnitDto> {
    if (input.thresholdProfileId) await this.checkProfile(farmId, input.thresholdProfileId);
    if (await this.repo.findByCode(farmId, input.code)) throw codeTaken(input.code);
    const outline = input.outline ?? null;
    const saved = await this.repo.insert({
      farmId,
      code: input.code,
      name: input.name,
      kind: input.kind,
      outline,
      areaM2: input.areaM2 ?? (outline ? polygonAreaM2(outline) : null),
      volumeM3: input.volumeM3 ?? null,
      waterType: input.waterType,
      defaultSalinityPpt: input.defaultSalinityPpt,
      species: input.species ?? null,
      lifeStage: input.lifeStage ?? null,
      state: input.state,
      testFrequencyDays: input.testFrequencyDays ?? null,
      qrLabelId: newLabelId(),
      walkOrder: input.walkOrder ?? (await this.repo.nextWalkOrder(farmId)),
      thresholdProfileId: input.thresholdProfileId ?? null,
      feedProteinFraction: input.feedProteinFraction,
      closeWatchUntil: null,
    });
    if (saved === 'code_taken') throw codeTaken(input.code);
    const dto = presentUnit(saved);
    await this.audit.record({ farmId, actorId, action: 'unit.created', entity: 'unit', entityId: saved.id, before: null, after: dto });
    return dto;
  }

  async update(farmId: string, unitId: string, patch: UpdateUnitRequest, actorId: string | null): Promise<UnitDto> {
    const unit = await this.require(farmId, unitId);
    const before = presentUnit(unit);
    if (patch.thresholdProfileId) await this.checkProfile(farmId, patch.thresholdProfileId);
    if (patch.code !== undefined && patch.code !== unit.code && (await this.repo.findByCode(farmId, patch.code)))
      throw codeTaken(patch.code);
    const { outline, areaM2, ...rest } = patch;
    Object.assign(unit, rest);
    if (outline !== undefined) unit.outline = outline;
    if (areaM2 !== undefined) unit.areaM2 = areaM2;
    // A new outline without an area: the area follows the outline.
    else if (outline) unit.areaM2 = polygonAreaM2(outline);
    const saved = await this.repo.save(unit);
    if (saved === 'code_taken') throw codeTaken(patch.code ?? unit.code);
    const after = presentUnit(saved);
    const { updatedAt: _b, ...beforeFields } = before;
    const { updatedAt: _a, ...afterFields } = after;
    const diff = changedFields(beforeFields, afterFields);
    if (Object.keys(diff.after).length) {
      await this.audit.record({
        farmId,
        actorId,
        action: 'unit.updated',
        entity: 'unit',
        entityId: unitId,
        before: diff.before,
        after: diff.after,
      });
    }
    return after;
  }

  /** What the unit's QR label encodes (the pondside test screen) and the code as SVG. */
  async label(farmId: string, unitId: string): Promise<UnitLabelResponse> {
    const unit = await this.require(farmId, unitId);
    const base = this.options.publicUrl.replace(/\/+$/, '');
    const url = `${base}/farms/${unit.farmId}/units/${unit.id}/test?label=${encodeURIComponent(unit.qrLabelId)}`;
    // Medium error correction survives a scuffed, wet label; the quiet zone is the standard 4 modules.
    const svg = await QRCode.toString(url, { type: 'svg', errorCorrectionLevel: 'M', margin: 4 });
    return { unitId: unit.id, farmId: unit.farmId, code: unit.code, name: unit.name, qrLabelId: unit.qrLabelId, url, svg };
  }

  /** A scanned label → its unit on this farm (404 for another farm's label, as for any unknown id). */
  async resolveLabel(farmId: string, qrLabelId: string): Promise<LabelResolveResponse> {
    const unit = await this.repo.findByLabel(farmId, qrLabelId);
    if (!unit) throw notFound('Label');
    return {
      farmId,
      unitId: unit.id,
      code: unit.code,
      name: unit.name,
      kind: unit.kind,
      testPath: `/farms/${farmId}/units/${unit.id}/test`,
    };
  }

  /** Records a hand-measured flow (hands, managers, admins) or a design flow (managers and admins only). */
  async addFlow(
    farmId: string,
    unitId: string,
    input: CreateFlowRequest,
    actor: { id: string | null; role: Role | null },
  ): Promise<FlowMeasurementDto> {
    await this.require(farmId, unitId);
    if (input.source === 'design' && actor.role !== 'manager' && actor.role !== 'admin') {
      throw forbidden('Only a manager or an admin can set the design flow.');
    }
    const measuredAt = input.measuredAt ? new Date(input.measuredAt) : new Date();
    if (measuredAt.getTime() > Date.now() + 5 * 60_000) {
      throw validationError({ formErrors: [], fieldErrors: { measuredAt: ['cannot be in the future'] } });
    }
    const row = await this.repo.insertFlow({
      farmId,
      unitId,
      measuredAt,
      flowLpm: input.flowLpm,
      source: input.source,
      note: input.note ?? null,
      recordedById: actor.id,
    });
    const dto = presentFlow(row);
    await this.audit.record({
      farmId,
      actorId: actor.id,
      action: 'unit.flow_recorded',
      entity: 'unit',
      entityId: unitId,
      before: null,
      after: dto,
    });
    return dto;
  }

  async listFlows(farmId: string, unitId: string, limit: number): Promise<{ items: FlowMeasurementDto[]; latest: LatestFlow | null }> {
    await this.require(farmId, unitId);
    const [items, latest] = await Promise.all([this.repo.listFlows(unitId, limit), this.latestFlowLpm(unitId)]);
    return { items: items.map(presentFlow), latest: presentLatestFlow(latest) };
  }

  /**
   * The unit's current flow, L/min: the newest of its probes' flow readings (not 'bad') and its manual
   * or design measurements. Null when there is none. Callers must have checked the unit's farm.
   */
  async latestFlowLpm(unitId: string): Promise<LatestFlowValue | null> {
    const [probe, measured] = await Promise.all([this.readings.latestForUnit(unitId, 'flow'), this.repo.latestFlow(unitId)]);
    const fromProbe: LatestFlowValue | null = probe
      ? { flowLpm: probe.value, at: probe.at, source: 'probe', probeId: probe.probeId, measurementId: null }
      : null;
    const fromMeasure: LatestFlowValue | null = measured
      ? { flowLpm: measured.flowLpm, at: measured.measuredAt, source: measured.source, probeId: null, measurementId: measured.id }
      : null;
    if (!fromProbe) return fromMeasure;
    if (!fromMeasure) return fromProbe;
    return fromMeasure.at.getTime() > fromProbe.at.getTime() ? fromMeasure : fromProbe;
  }

  /** The newest design flow of the unit, L/min, or null (raceway and tank models, the simulator). */
  async designFlowLpm(unitId: string): Promise<number | null> {
    return (await this.repo.latestFlow(unitId, 'design'))?.flowLpm ?? null;
  }

  private async checkProfile(farmId: string, profileId: string): Promise<void> {
    if (!(await this.repo.thresholdProfileOnFarm(farmId, profileId))) {
      throw validationError({ formErrors: [], fieldErrors: { thresholdProfileId: ['no threshold profile with this id on this farm'] } });
    }
  }
}
