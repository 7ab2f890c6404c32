import { localParts } from '../../../shared/farm-time';
import type { OnCallEntryDto, OnCallResponse, PutOnCallRequest } from '../../../shared/schemas/alerts.schema';
import type { OnCallEntry } from '../../db/entities';
import { notFound, validationError } from '../../http/errors';
import type { FarmDirectory } from '../alerts/ports';
import type { AuditPort } from '../thresholds/thresholds.service';
import type { OnCallRepository, Person } from './on-call.repository';

const minutesOf = (hhmm: string) => {
  const [h, m] = hhmm.split(':').map(Number) as [number, number];
  return h * 60 + m;
};

/**
 * Whether an on-call entry's hours cover an instant, in the farm's time zone. Hours that end before they
 * start run past midnight (18:00–06:00); the part after midnight belongs to the weekday the shift started.
 */
export function coversAt(entry: Pick<OnCallEntry, 'startsLocal' | 'endsLocal' | 'weekdays'>, at: Date, timeZone: string): boolean {
  const p = localParts(at, timeZone);
  const now = p.hour * 60 + p.minute;
  const start = minutesOf(entry.startsLocal);
  const end = minutesOf(entry.endsLocal);
  const days = new Set(entry.weekdays);
  if (start < end) return days.has(p.weekday) && now >= start && now < end;
  const previous = p.weekday === 1 ? 7 : p.weekday - 1;
  return (days.has(p.weekday) && now >= start) || (days.has(previous) && now < end);
}

export type OnCallPerson = Person & { position: number | null };

export class OnCallService {
  constructor(
    private readonly repo: OnCallRepository,
    private readonly farms: FarmDirectory,
    private readonly audit: AuditPort,
  ) {}

  private async farmOrThrow(farmId: string) {
    const farm = await this.farms.farm(farmId);
    if (!farm) throw notFound('Farm');
    return farm;
  }

  async get(farmId: string, now: Date = new Date()): Promise<OnCallResponse> {
    const farm = await this.farmOrThrow(farmId);
    const entries = await this.repo.list(farmId);
    const people = await this.repo.people(farmId, entries.map((e) => e.userId));
    const dtos = entries.map((e): OnCallEntryDto => {
      const p = people.get(e.userId);
      return {
        id: e.id,
        position: e.position,
        userId: e.userId,
        name: p?.name ?? '(unknown person)',
        email: p?.email ?? '',
        role: p?.role ?? 'hand',
        startsLocal: e.startsLocal,
        endsLocal: e.endsLocal,
        weekdays: e.weekdays,
        coversNow: Boolean(p?.active) && coversAt(e, now, farm.timeZone),
      };
    });
    return {
      farmId,
      timeZone: farm.timeZone,
      escalationMinutes: farm.settings.escalationMinutes,
      entries: dtos,
      firstNow: dtos.find((d) => d.coversNow) ?? null,
      afterList: 'managers_then_stop',
    };
  }

  /** Replaces the list (order = escalation order). Everyone on it must belong to the farm. Audited. */
  async put(farmId: string, body: PutOnCallRequest, actorId: string | null, now: Date = new Date()): Promise<OnCallResponse> {
    await this.farmOrThrow(farmId);
    const people = await this.repo.people(farmId, body.entries.map((e) => e.userId));
    const problems: Record<string, string[]> = {};
    body.entries.forEach((e, i) => {
      const p = people.get(e.userId);
      if (!p || !p.role) problems[`entries.${i}.userId`] = ['not a person on this farm'];
      else if (!p.active) problems[`entries.${i}.userId`] = ['this person is deactivated'];
    });
    if (Object.keys(problems).length) throw validationError({ formErrors: [], fieldErrors: problems });
    const before = (await this.repo.list(farmId)).map(snapshot);
    const saved = await this.repo.replace(
      farmId,
      body.entries.map((e) => ({ userId: e.userId, startsLocal: e.startsLocal, endsLocal: e.endsLocal, weekdays: [...e.weekdays].sort() })),
    );
    await this.audit.record({ farmId, actorId, action: 'on_call.updated', entity: 'on_call_list', entityId: farmId, before: { entries: before }, after: { entries: saved.map(snapshot) } });
    return this.get(farmId, now);
  }

  /** The active people whose on-call hours cover `at`, in list order. */
  async coveringAt(farmId: string, at: Date): Promise<OnCallPerson[]> {
    const farm = await this.farmOrThrow(farmId);
    const entries = await this.repo.list(farmId);
    const people = await this.repo.people(farmId, entries.map((e) => e.userId));
    const out: OnCallPerson[] = [];
    for (const e of entries) {
      const p = people.get(e.userId);
      if (p?.active && p.role && coversAt(e, at, farm.timeZone)) out.push({ ...p, position: e.position });
    }
    return out;
  }

  /** The farm's active managers: told when the on-call list runs out, and sent the morning report. */
  async managers(farmId: string): Promise<OnCallPerson[]> {
    return (await this.repo.managers(farmId)).map((p) => ({ ...p, position: null }));
  }

  /** People of the farm by id (for names and e-mail addresses). */
  people(farmId: string, userIds: string[]): Promise<Map<string, Person>> {
    return this.repo.people(farmId, [...new Set(userIds)]);
  }
}

const snapshot = (e: OnCallEntry) => ({ position: e.position, userId: e.userId, startsLocal: e.startsLocal, endsLocal: e.endsLocal, weekdays: e.weekdays });
