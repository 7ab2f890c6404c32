import type { AlertDto, AlertEventDto, AlertListQuery, AlertSummaryResponse } from '../../../shared/schemas/alerts.schema';
import type { UnitStatusLevel } from '../../../shared/schemas/farms.schema';
import type { JobPayload } from '../../../shared/schemas/jobs.schema';
import type { Alert } from '../../db/entities';
import { badRequest, conflict, notFound, validationError } from '../../http/errors';
import type { Logger } from '../../lib/logger';
import type { Queues } from '../../queues';
import type { LiveService } from '../live/live.service';
import { unitStatusOf, type Check } from './alert-rules';
import { jsonSafe, presentAlert, presentEvent, type AlertLabels } from './alerts.presenter';
import type { AlertsRepository } from './alerts.repository';
import type { FarmDirectory } from './ports';

const MINUTE = 60_000;
/** An unchanged open alert's lastSeenAt is refreshed at most this often (a sweep every 60 s stays cheap). */
const SEEN_REFRESH_MS = 5 * MINUTE;

export type ApplyInput = {
  checks: Check[];
  /** The open alerts the checks speak for (one unit's, or the farm-level ones). */
  open: Alert[];
  /** Keys with no check that stay open (a silent probe's data-quality conditions). */
  holdPrefixes?: string[];
  /** Resolution note for open alerts in scope that no check speaks for. */
  scopeNote: string;
  now: Date;
};

export type ApplyOutcome = { opened: string[]; raised: string[]; resolved: string[] };

const encodeCursor = (a: { openedAt: Date; id: string }) => Buffer.from(`${a.openedAt.toISOString()}|${a.id}`).toString('base64url');
function decodeCursor(cursor: string): { at: Date; id: string } {
  const [at, id] = Buffer.from(cursor, 'base64url').toString('utf8').split('|');
  const when = at ? new Date(at) : null;
  if (!when || Number.isNaN(when.getTime()) || !id || !/^[0-9a-f-]{36}$/i.test(id)) {
    throw badRequest('The paging cursor is not valid; start again without it.', { fieldErrors: { cursor: ['not a cursor this API issued'] } }, 'validation_failed');
  }
  return { at: when, id };
}

/**
 * Alert lifecycle: open (one per open condition), level upgrade, acknowledge, assign, resolve (by hand or
 * when the condition clears with hysteresis), re-alert; every step an AlertEvent and a live event. The
 * on-call e-mails are queued here (notify-alert jobs) and sent by the EscalationService.
 */
export class AlertsService {
  constructor(
    private readonly repo: AlertsRepository,
    private readonly live: Pick<LiveService, 'notify'>,
    private readonly queues: Queues,
    private readonly farms: FarmDirectory,
    private readonly logger: Logger,
  ) {}

  // --- reading ---

  private async labels(alerts: Alert[], extraUserIds: Array<string | null> = []): Promise<AlertLabels> {
    const [users, units, probes] = await Promise.all([
      this.repo.userNames([...alerts.flatMap((a) => [a.acknowledgedById, a.assignedToId, a.resolvedById]), ...extraUserIds]),
      this.repo.unitLabels(alerts.map((a) => a.unitId)),
      this.repo.probeLabels(alerts.map((a) => a.probeId)),
    ]);
    return { users, units, probes };
  }

  async present(alerts: Alert[]): Promise<AlertDto[]> {
    const labels = await this.labels(alerts);
    return alerts.map((a) => presentAlert(a, labels));
  }

  async list(farmId: string, q: AlertListQuery): Promise<{ alerts: AlertDto[]; nextCursor: string | null }> {
    const states: Alert['state'][] =
      q.state === 'active' ? ['open', 'acknowledged'] : q.state === 'all' ? ['open', 'acknowledged', 'resolved'] : [q.state];
    const rows = await this.repo.list(farmId, { states, unitId: q.unitId, kind: q.kind, level: q.level, before: q.cursor ? decodeCursor(q.cursor) : undefined, limit: q.limit + 1 });
    const page = rows.slice(0, q.limit);
    const last = page[page.length - 1];
    return { alerts: await this.present(page), nextCursor: rows.length > q.limit && last ? encodeCursor(last) : null };
  }

  async get(farmId: string, alertId: string): Promise<{ alert: AlertDto; events: AlertEventDto[] }> {
    const a = await this.repo.find(farmId, alertId);
    if (!a) throw notFound('Alert');
    const events = await this.repo.eventsOf(a.id);
    const labels = await this.labels([a], events.map((e) => e.userId));
    return { alert: presentAlert(a, labels), events: events.map((e) => presentEvent(e, labels.users)) };
  }

  /** Open and acknowledged alerts of a farm (optionally one unit's, some kinds): for other modules, e.g. feed recommendations. */
  async activeAlerts(farmId: string, filter: { unitId?: string; kinds?: string[] } = {}): Promise<AlertDto[]> {
    const open = await this.repo.openAlerts(farmId, filter.unitId ? { unitIds: [filter.unitId] } : {});
    return this.present(open.filter((a) => !filter.kinds || filter.kinds.includes(a.kind)));
  }

  /** The raw open alerts of a farm (the evaluation partitions them by unit). */
  openAlertsOf(farmId: string, scope: { unitIds?: string[]; farmLevel?: boolean } = {}): Promise<Alert[]> {
    return this.repo.openAlerts(farmId, scope);
  }

  /** For the morning report: alerts opened in [from, to), and the missed checks open in that time. */
  async nightAlerts(farmId: string, from: Date, to: Date): Promise<{ opened: AlertDto[]; overdueTests: AlertDto[]; silentProbes: AlertDto[] }> {
    const [opened, overdue, silent] = await Promise.all([
      this.repo.openedBetween(farmId, from, to),
      this.repo.openDuring(farmId, ['test_overdue'], to, new Date(to.getTime() + 1)),
      this.repo.openDuring(farmId, ['probe_silent'], from, to),
    ]);
    const all = await this.present([...opened, ...overdue, ...silent]);
    const byId = new Map(all.map((a) => [a.id, a]));
    const pick = (list: Alert[]) => list.map((a) => byId.get(a.id)).filter((a): a is AlertDto => Boolean(a));
    return { opened: pick(opened), overdueTests: pick(overdue), silentProbes: pick(silent) };
  }

  async isFarmSilent(farmId: string): Promise<boolean> {
    return Boolean(await this.repo.findOpenByKey(farmId, 'farm_silent'));
  }

  /**
   * Map status per unit from the open alerts: act > silent > watch > clear (alert-rules unitStatusOf).
   * One query for the alerts and one for the probes, whatever the number of units.
   */
  async statusFor(farmId: string, units: Array<{ id: string; state: string }>): Promise<Map<string, UnitStatusLevel>> {
    const [open, probes] = await Promise.all([this.repo.openAlerts(farmId), this.repo.activeProbesByUnit(farmId)]);
    const farmSilent = open.some((a) => a.kind === 'farm_silent');
    const byUnit = new Map<string, Alert[]>();
    for (const a of open) if (a.unitId) byUnit.set(a.unitId, [...(byUnit.get(a.unitId) ?? []), a]);
    return new Map(
      units.map((u) => [
        u.id,
        unitStatusOf({
          fallow: u.state === 'fallow',
          activeProbeIds: probes.get(u.id) ?? [],
          farmSilent,
          alerts: (byUnit.get(u.id) ?? []).map((a) => ({ kind: a.kind, level: a.level, probeId: a.probeId })),
        }),
      ]),
    );
  }

  async summary(farmId: string, units: Array<{ id: string; state: string }>, now = new Date()): Promise<AlertSummaryResponse> {
    const [open, status] = await Promise.all([this.repo.openAlerts(farmId), this.statusFor(farmId, units)]);
    const count = (list: Alert[], level: 'watch' | 'act') => list.filter((a) => a.level === level).length;
    return {
      farmId,
      generatedAt: now.toISOString(),
      farmSilent: open.some((a) => a.kind === 'farm_silent'),
      open: { watch: count(open, 'watch'), act: count(open, 'act'), unacknowledged: open.filter((a) => a.state === 'open').length },
      units: units.map((u) => {
        const mine = open.filter((a) => a.unitId === u.id);
        return {
          unitId: u.id,
          status: status.get(u.id) ?? 'clear',
          open: { watch: count(mine, 'watch'), act: count(mine, 'act') },
          kinds: [...new Set(mine.map((a) => a.kind))] as AlertSummaryResponse['units'][number]['kinds'],
        };
      }),
    };
  }

  // --- people acting on alerts ---

  private async settingsOf(farmId: string) {
    const farm = await this.farms.farm(farmId);
    if (!farm) throw notFound('Farm');
    return farm.settings;
  }

  private notifyLive(a: Pick<Alert, 'id' | 'farmId' | 'unitId' | 'kind' | 'level'>, state: Alert['state'], event: string, extra: Record<string, unknown> = {}) {
    this.live.notify({ type: 'alert', farmId: a.farmId, unitId: a.unitId, data: { alertId: a.id, kind: a.kind, level: a.level, state, event, ...extra } });
  }

  /** Acknowledge: stops the escalation walk and schedules a re-alert after realertMinutes. Idempotent. */
  async acknowledge(farmId: string, alertId: string, userId: string, note?: string, now = new Date()): Promise<AlertDto> {
    const a = await this.repo.find(farmId, alertId);
    if (!a) throw notFound('Alert');
    if (a.state === 'resolved') throw conflict('This alert is already resolved.', undefined, 'alert_resolved');
    if (a.state === 'open') {
      const settings = await this.settingsOf(farmId);
      const realertAt = new Date(now.getTime() + settings.realertMinutes * MINUTE);
      if (await this.repo.acknowledge(farmId, alertId, userId, now, realertAt)) {
        await this.repo.addEvent({ alertId, type: 'acknowledged', userId, details: { note: note ?? null, realertAt: realertAt.toISOString(), escalationStep: a.escalationStep }, at: now });
        this.notifyLive(a, 'acknowledged', 'acknowledged', { userId });
      }
    }
    return (await this.present([(await this.repo.find(farmId, alertId)) as Alert]))[0]!;
  }

  /** Assign to a person of the farm (manager/admin); the assignee is e-mailed. */
  async assign(farmId: string, alertId: string, actorId: string, userId: string, note?: string, now = new Date()): Promise<AlertDto> {
    const a = await this.repo.find(farmId, alertId);
    if (!a) throw notFound('Alert');
    if (a.state === 'resolved') throw conflict('This alert is already resolved.', undefined, 'alert_resolved');
    if (!(await this.repo.isFarmPerson(farmId, userId))) throw validationError({ formErrors: [], fieldErrors: { userId: ['not an active person on this farm'] } });
    if (await this.repo.assign(farmId, alertId, userId)) {
      const event = await this.repo.addEvent({ alertId, type: 'assigned', userId: actorId, details: { to: userId, from: a.assignedToId, note: note ?? null }, at: now });
      this.notifyLive(a, a.state, 'assigned', { assignedToId: userId });
      if (userId !== actorId) {
        await this.queues.add('notifyAlert', { alertId, step: 0, reason: 'assigned', farmId, userId }, { jobId: `alert-${alertId}-assigned-${event.id}`, attempts: 8, backoff: { type: 'exponential', delay: 2000 } });
      }
    }
    return (await this.present([(await this.repo.find(farmId, alertId)) as Alert]))[0]!;
  }

  /** Resolve by hand with a note (manager/admin). If the condition is still there, the next evaluation opens a new alert. */
  async resolveByHand(farmId: string, alertId: string, userId: string, note: string, now = new Date()): Promise<AlertDto> {
    const a = await this.repo.find(farmId, alertId);
    if (!a) throw notFound('Alert');
    if (a.state === 'resolved') throw conflict('This alert is already resolved.', undefined, 'alert_resolved');
    if (await this.repo.resolve(alertId, { userId, note, at: now })) {
      await this.repo.addEvent({ alertId, type: 'resolved', userId, details: { auto: false, note }, at: now });
      this.notifyLive(a, 'resolved', 'resolved', { auto: false });
    }
    return (await this.present([(await this.repo.find(farmId, alertId)) as Alert]))[0]!;
  }

  // --- the evaluation's side ---

  /**
   * Applies an evaluation's checks to the open alerts they speak for: raise → open a new alert (race-safe)
   * or refresh the open one (recording a watch → act upgrade); clear → resolve automatically; hold → leave
   * as is. Open alerts in scope that no check speaks for are resolved with `scopeNote`.
   */
  async apply(farmId: string, input: ApplyInput): Promise<ApplyOutcome> {
    const out: ApplyOutcome = { opened: [], raised: [], resolved: [] };
    const byKey = new Map(input.open.map((a) => [a.conditionKey, a]));
    const seen = new Set<string>();
    for (const c of input.checks) {
      seen.add(c.conditionKey);
      const a = byKey.get(c.conditionKey);
      if (c.verdict === 'raise') {
        if (a) {
          if (await this.refresh(a, c, input.now)) out.raised.push(a.id);
        } else {
          const id = await this.open(farmId, c, input.now);
          if (id) out.opened.push(id);
        }
      } else if (c.verdict === 'clear' && a) {
        if (await this.autoResolve(a, c.note ?? 'The condition cleared.', input.now, c.values)) out.resolved.push(a.id);
      }
    }
    const holds = input.holdPrefixes ?? [];
    for (const a of input.open) {
      if (seen.has(a.conditionKey) || holds.some((p) => a.conditionKey.startsWith(p))) continue;
      if (await this.autoResolve(a, input.scopeNote, input.now, {})) out.resolved.push(a.id);
    }
    return out;
  }

  private async open(farmId: string, c: Check, now: Date): Promise<string | null> {
    const level = c.level ?? 'watch';
    const row = {
      farmId,
      unitId: c.unitId,
      probeId: c.probeId,
      kind: c.kind,
      level,
      conditionKey: c.conditionKey,
      title: c.title ?? c.kind,
      message: c.message ?? '',
      values: jsonSafe(c.values),
      rule: jsonSafe(c.rule ?? {}),
      openedAt: now,
      lastSeenAt: now,
    };
    const inserted = await this.repo.insertOpen(row);
    if (inserted === 'exists') {
      // Another worker opened it a moment ago: update that one instead.
      const existing = await this.repo.findOpenByKey(farmId, c.conditionKey);
      if (existing) await this.refresh(existing, c, now);
      return null;
    }
    await this.repo.addEvent({ alertId: inserted.id, type: 'opened', userId: null, details: { level, title: row.title, message: row.message, values: row.values }, at: now });
    this.notifyLive(inserted, 'open', 'opened');
    if (level === 'act') await this.startWalk(inserted.id, 'opened', now);
    return inserted.id;
  }

  /** Refreshes an open alert's values; true when its level went up (watch → act). */
  private async refresh(a: Alert, c: Check, now: Date): Promise<boolean> {
    let raised = false;
    if (c.level === 'act' && a.level === 'watch' && (await this.repo.raiseLevel(a.id))) {
      raised = true;
      await this.repo.addEvent({ alertId: a.id, type: 'escalated_level', userId: null, details: { from: 'watch', to: 'act', message: c.message, values: jsonSafe(c.values) }, at: now });
      // An act-level condition needs someone now: an acknowledged alert returns to open and the on-call walk starts.
      if (a.state === 'acknowledged') await this.repo.reopen(a.id);
      this.notifyLive({ ...a, level: 'act' }, 'open', 'level_raised');
      await this.startWalk(a.id, 'level_raised', now);
    } else if (a.level === 'act' && a.state === 'open' && a.escalationStep === 0) {
      // The walk of a freshly opened act alert did not start (its job was not queued): start it now.
      await this.startWalk(a.id, 'opened', now);
    }
    const values = jsonSafe(c.values);
    const changed =
      raised ||
      JSON.stringify(values) !== JSON.stringify(a.values) ||
      c.title !== a.title ||
      c.message !== a.message ||
      c.unitId !== a.unitId ||
      c.probeId !== a.probeId ||
      now.getTime() - a.lastSeenAt.getTime() > SEEN_REFRESH_MS;
    if (changed) {
      await this.repo.updateSeen(a.id, {
        values,
        rule: jsonSafe((raised || a.level === c.level ? c.rule : a.rule) ?? {}),
        title: c.title ?? a.title,
        message: c.message ?? a.message,
        lastSeenAt: now,
        unitId: c.unitId,
        probeId: c.probeId,
      });
    }
    return raised;
  }

  private async autoResolve(a: Alert, note: string, now: Date, values: Record<string, unknown>): Promise<boolean> {
    if (!(await this.repo.resolve(a.id, { userId: null, note, at: now }))) return false;
    await this.repo.addEvent({ alertId: a.id, type: 'resolved', userId: null, details: { auto: true, note, values: jsonSafe(values) }, at: now });
    this.notifyLive(a, 'resolved', 'resolved', { auto: true });
    return true;
  }

  /**
   * Starts (or restarts) the on-call walk: claims the next notification step and queues its job. The
   * job id is per alert and step, so a retried or duplicated start sends once.
   */
  private async startWalk(alertId: string, reason: 'opened' | 'realert' | 'level_raised', now: Date): Promise<void> {
    const a = await this.repo.findById(alertId);
    if (!a || a.state !== 'open') return;
    const settings = await this.settingsOf(a.farmId);
    const step = a.escalationStep + 1;
    await this.queueNotify({ alertId, step, reason, farmId: a.farmId });
    await this.repo.claimStep(alertId, a.escalationStep, step, new Date(now.getTime() + settings.escalationMinutes * MINUTE));
  }

  private queueNotify(payload: JobPayload<'notifyAlert'>): Promise<void> {
    // E-mail providers have bad minutes: more attempts, spaced further apart, than the default.
    return this.queues.add('notifyAlert', payload, { jobId: `alert-${payload.alertId}-step-${payload.step}`, attempts: 8, backoff: { type: 'exponential', delay: 2000 } });
  }

  /**
   * Re-alerts: an acknowledged alert still open realertMinutes after its acknowledgement returns to open.
   * Act level restarts the on-call walk; watch level e-mails the person who acknowledged it.
   */
  async realertDue(farmId: string, now = new Date()): Promise<string[]> {
    const due = await this.repo.dueRealerts(farmId, now);
    const done: string[] = [];
    for (const a of due) {
      if (!(await this.repo.reopenForRealert(a.id, now))) continue;
      const minutes = a.acknowledgedAt ? Math.round((now.getTime() - a.acknowledgedAt.getTime()) / MINUTE) : null;
      await this.repo.addEvent({ alertId: a.id, type: 'realerted', userId: null, details: { acknowledgedById: a.acknowledgedById, acknowledgedAt: a.acknowledgedAt?.toISOString() ?? null, minutesSinceAcknowledged: minutes }, at: now });
      this.notifyLive(a, 'open', 'realerted');
      if (a.level === 'act') await this.startWalk(a.id, 'realert', now);
      else if (a.acknowledgedById) {
        const step = a.escalationStep + 1;
        await this.queueNotify({ alertId: a.id, step, reason: 'realert', farmId, userId: a.acknowledgedById });
        await this.repo.claimStep(a.id, a.escalationStep, step, null);
      }
      done.push(a.id);
    }
    if (done.length) this.logger.info({ farmId, alerts: done.length }, 're-alerted');
    return done;
  }
}
