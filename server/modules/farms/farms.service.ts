import type { Role } from '../../../shared/schemas/auth.schema';
import type {
  CreateFarmRequest,
  FarmDto,
  FarmStatusResponse,
  LatestResult,
  LatestValue,
  UnitStatusDto,
  UnitStatusLevel,
  UpdateFarmRequest,
} from '../../../shared/schemas/farms.schema';
import { canonicalUnit, type Quantity } from '../../../shared/schemas/mqtt.schema';
import type { FarmSettings } from '../../db/entities';
import { conflict, notFound } from '../../http/errors';
import { changedFields, type AuditService } from '../audit/audit.service';
import type { ReadingsService } from '../readings/readings.service';
import type { UnitsService } from '../units/units.service';
import { localDayIn } from './farm-time';
import { mergeSettings, presentFarm } from './farms.presenter';
import type { FarmsRepository } from './farms.repository';

/** The units a status provider is asked about, with what the farm map already knows of them. */
export type UnitStatusQuery = {
  farmId: string;
  units: Array<{ id: string; state: UnitStatusDto['state']; lastReadingAt: Date | null }>;
  now: Date;
};

/**
 * Supplies the map status (clear/watch/act/silent) of a farm's units: the alerts module installs one
 * with `farms.useUnitStatusProvider(...)` in server/container.ts. Answer for all units in one call
 * (no query per unit); a unit missing from the map gets `status: null`. The default knows nothing.
 */
export type UnitStatusProvider = (q: UnitStatusQuery) => Promise<Map<string, UnitStatusLevel>>;

/**
 * Supplies each unit's newest free-ammonia result: the results (water-tests) module installs one with
 * `farms.useLatestResultProvider(...)`. Same contract as UnitStatusProvider; the default knows nothing.
 */
export type LatestResultProvider = (q: UnitStatusQuery) => Promise<Map<string, LatestResult>>;

const noStatus: UnitStatusProvider = async () => new Map();
const noResult: LatestResultProvider = async () => new Map();

/** Who is asking for the farm list: admins see every farm, others the farms they belong to. */
export type FarmViewer = { isAdmin: boolean; memberships: Map<string, Exclude<Role, 'admin'>> };

export class FarmsService {
  private unitStatus: UnitStatusProvider = noStatus;
  private latestResult: LatestResultProvider = noResult;

  constructor(
    private readonly repo: FarmsRepository,
    private readonly audit: AuditService,
    private readonly units: UnitsService,
    private readonly readings: ReadingsService,
  ) {}

  useUnitStatusProvider(provider: UnitStatusProvider): void {
    this.unitStatus = provider;
  }
  useLatestResultProvider(provider: LatestResultProvider): void {
    this.latestResult = provider;
  }

  async listFor(viewer: FarmViewer): Promise<FarmDto[]> {
    const farms = viewer.isAdmin ? await this.repo.all() : await this.repo.byIds([...viewer.memberships.keys()]);
    return farms.map((f) => presentFarm(f, viewer.memberships.get(f.id) ?? 'admin'));
  }

  async get(farmId: string, role: Role): Promise<FarmDto> {
    const farm = await this.repo.find(farmId);
    if (!farm) throw notFound('Farm');
    return presentFarm(farm, role);
  }

  async create(input: CreateFarmRequest, actorId: string | null): Promise<FarmDto> {
    const taken = () =>
      conflict(`A farm with slug ${input.slug} already exists.`, { fieldErrors: { slug: ['already used'] } }, 'slug_taken');
    if (await this.repo.findBySlug(input.slug)) throw taken();
    const saved = await this.repo.insert({
      slug: input.slug,
      name: input.name,
      timeZone: input.timeZone,
      longitude: input.longitude ?? null,
      latitude: input.latitude ?? null,
      settings: input.settings ?? {},
      displayPrefs: input.displayPrefs ?? {},
    });
    if (saved === 'slug_taken') throw taken();
    const dto = presentFarm(saved, 'admin');
    const { role: _r, ...snapshot } = dto;
    await this.audit.record({
      farmId: saved.id,
      actorId,
      action: 'farm.created',
      entity: 'farm',
      entityId: saved.id,
      before: null,
      after: snapshot,
    });
    return dto;
  }

  /** Name, time zone, location, settings (merged into the stored ones) and display defaults. Audited. */
  async update(farmId: string, patch: UpdateFarmRequest, actorId: string | null, role: Role): Promise<FarmDto> {
    const farm = await this.repo.find(farmId);
    if (!farm) throw notFound('Farm');
    const before = presentFarm(farm, role);
    if (patch.name !== undefined) farm.name = patch.name;
    if (patch.timeZone !== undefined) farm.timeZone = patch.timeZone;
    if (patch.longitude !== undefined) farm.longitude = patch.longitude;
    if (patch.latitude !== undefined) farm.latitude = patch.latitude;
    if (patch.settings) farm.settings = { ...farm.settings, ...patch.settings };
    if (patch.displayPrefs) farm.displayPrefs = { ...farm.displayPrefs, ...patch.displayPrefs };
    const after = presentFarm(await this.repo.save(farm), role);
    const strip = ({ updatedAt: _u, role: _r, ...rest }: FarmDto) => rest;
    const diff = changedFields(strip(before), strip(after));
    if (Object.keys(diff.after).length) {
      await this.audit.record({
        farmId,
        actorId,
        action: 'farm.updated',
        entity: 'farm',
        entityId: farmId,
        before: diff.before,
        after: diff.after,
      });
    }
    return after;
  }

  /** Every setting of the farm: the stored ones merged over defaultFarmSettings. 404 for an unknown farm. */
  async getSettings(farmId: string): Promise<FarmSettings> {
    const farm = await this.repo.findSettings(farmId);
    if (!farm) throw notFound('Farm');
    return mergeSettings(farm.settings);
  }

  /** The farm's IANA time zone. */
  async timeZone(farmId: string): Promise<string> {
    const farm = await this.repo.findSettings(farmId);
    if (!farm) throw notFound('Farm');
    return farm.timeZone;
  }

  /** The farm-local calendar day (YYYY-MM-DD) at `at`: "today" for tests, rations and reports. */
  async localDay(farmId: string, at: Date = new Date()): Promise<string> {
    return localDayIn(await this.timeZone(farmId), at);
  }

  /**
   * The live farm map: every unit with its newest probe value per quantity (one top-1 index lookup
   * per probe and quantity), plus the status and latest result from the installed providers.
   */
  async status(farmId: string, now: Date = new Date()): Promise<FarmStatusResponse> {
    const timeZone = await this.timeZone(farmId);
    const [units, latestRows] = await Promise.all([this.units.list(farmId), this.readings.latestForFarm(farmId)]);
    const latestByUnit = new Map<string, Partial<Record<Quantity, LatestValue>>>();
    const lastAt = new Map<string, Date>();
    for (const r of latestRows) {
      const quantity = r.quantity as Quantity;
      const perUnit = latestByUnit.get(r.unitId) ?? {};
      const cur = perUnit[quantity];
      if (!cur || Date.parse(cur.at) < r.at.getTime()) {
        perUnit[quantity] = {
          value: r.value,
          unit: canonicalUnit[quantity],
          at: r.at.toISOString(),
          quality: r.quality,
          probeId: r.probeId,
        };
      }
      latestByUnit.set(r.unitId, perUnit);
      const prev = lastAt.get(r.unitId);
      if (!prev || prev < r.at) lastAt.set(r.unitId, r.at);
    }
    const query: UnitStatusQuery = {
      farmId,
      now,
      units: units.map((u) => ({ id: u.id, state: u.state, lastReadingAt: lastAt.get(u.id) ?? null })),
    };
    const [statuses, results] = await Promise.all([this.unitStatus(query), this.latestResult(query)]);
    return {
      farmId,
      timeZone,
      localDay: localDayIn(timeZone, now),
      generatedAt: now.toISOString(),
      units: units.map((u) => ({
        id: u.id,
        code: u.code,
        name: u.name,
        kind: u.kind,
        state: u.state,
        waterType: u.waterType,
        walkOrder: u.walkOrder,
        outline: u.outline,
        latest: latestByUnit.get(u.id) ?? {},
        lastReadingAt: lastAt.get(u.id)?.toISOString() ?? null,
        status: statuses.get(u.id) ?? null,
        latestResult: results.get(u.id) ?? null,
      })),
    };
  }
}
