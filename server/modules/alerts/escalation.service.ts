import { localParts } from '../../../shared/farm-time';
import type { JobPayload } from '../../../shared/schemas/jobs.schema';
import { THRESHOLD_CAUTION } from '../../../shared/schemas/thresholds.schema';
import type { Alert, AlertEvent } from '../../db/entities';
import type { Logger } from '../../lib/logger';
import type { Queues } from '../../queues';
import type { NotificationsService } from '../notifications/notifications.service';
import type { OnCallPerson, OnCallService } from '../on-call/on-call.service';
import { localHhmm } from './alert-rules';
import type { AlertsRepository } from './alerts.repository';
import type { FarmDirectory, FarmInfo } from './ports';

const MINUTE = 60_000;

type Recipient = { userId: string; name: string; email: string; position: number | null; role: string | null };
type WalkDetails = { step: number; walk: boolean; walkStart: number; managers?: boolean; recipients: Recipient[] };

/**
 * Escalation: an act-level alert e-mails the first on-call person whose hours cover now (farm-local);
 * when nobody acknowledges within escalationMinutes, the next one covering now; after the last, the
 * farm's managers once; then it stops (the alert stays open on the screens). Every step is an
 * AlertEvent; every e-mail goes through NotificationsService (kind 'alert' first, then 'escalation').
 */
export class EscalationService {
  constructor(
    private readonly repo: AlertsRepository,
    private readonly onCall: Pick<OnCallService, 'coveringAt' | 'managers' | 'people'>,
    private readonly notifications: Pick<NotificationsService, 'send'>,
    private readonly farms: FarmDirectory,
    private readonly queues: Queues,
    private readonly options: { publicUrl: string },
    private readonly logger: Logger,
  ) {}

  /**
   * The escalate-alerts tick (every 30 s): for each unacknowledged act-level alert whose next step is due,
   * queue that step (job id per alert and step) and claim it. Queue first, claim second: a crash in
   * between re-queues the same job id next tick, which BullMQ keeps once.
   */
  async tick(now = new Date()): Promise<{ queued: number }> {
    const due = await this.repo.dueEscalations(now);
    const farms = new Map<string, FarmInfo | null>();
    let queued = 0;
    for (const a of due) {
      if (!farms.has(a.farmId)) farms.set(a.farmId, await this.farms.farm(a.farmId));
      const farm = farms.get(a.farmId);
      if (!farm) continue;
      const step = a.escalationStep + 1;
      await this.queues.add('notifyAlert', { alertId: a.id, step, reason: 'escalated', farmId: a.farmId }, { jobId: `alert-${a.id}-step-${step}`, attempts: 8, backoff: { type: 'exponential', delay: 2000 } });
      if (await this.repo.claimStep(a.id, a.escalationStep, step, new Date(now.getTime() + farm.settings.escalationMinutes * MINUTE))) queued++;
    }
    return { queued };
  }

  /** The notify-alert job: works out who to tell for this step, e-mails them and records the step. Idempotent per alert and step. */
  async deliver(p: JobPayload<'notifyAlert'>, now = new Date()): Promise<{ sent: string[]; skipped?: string }> {
    const a = await this.repo.findById(p.alertId);
    if (!a) return { sent: [], skipped: 'alert not found' };
    if (a.state === 'resolved') return { sent: [], skipped: 'resolved' };
    if (p.reason === 'escalated' && a.state !== 'open') return { sent: [], skipped: 'acknowledged' };
    if (p.reason !== 'assigned' && (await this.repo.hasStepEvent(a.id, p.step))) return { sent: [], skipped: 'already sent' };
    const farm = await this.farms.farm(a.farmId);
    if (!farm) return { sent: [], skipped: 'farm not found' };

    let recipients: Recipient[] = [];
    let details: WalkDetails;
    let type: AlertEvent['type'] = 'notified';
    let stop = false;
    const direct = p.userId && (p.reason === 'assigned' || p.reason === 'realert');
    if (direct) {
      const person = (await this.onCall.people(a.farmId, [p.userId as string])).get(p.userId as string);
      if (person?.active) recipients = [toRecipient({ ...person, position: null })];
      details = { step: p.step, walk: false, walkStart: p.step, recipients };
    } else {
      const events = await this.repo.eventsOf(a.id);
      const walkEvents = events.filter((e) => (e.type === 'notified' || e.type === 'escalated') && (e.details as Partial<WalkDetails>).walk === true);
      const latest = walkEvents[walkEvents.length - 1]?.details as WalkDetails | undefined;
      const continuing = p.reason === 'escalated' && latest !== undefined;
      const walkStart = continuing ? latest.walkStart : p.step;
      const walk = continuing ? walkEvents.map((e) => e.details as WalkDetails).filter((d) => d.walkStart === walkStart) : [];
      const told = new Set(walk.flatMap((d) => d.recipients.map((r) => r.userId)));
      const lastPosition = Math.max(0, ...walk.flatMap((d) => d.recipients.map((r) => r.position ?? 0)));
      const covering = await this.onCall.coveringAt(a.farmId, now);
      const next = covering.find((c) => (c.position ?? 0) > lastPosition && !told.has(c.id));
      let managers = false;
      if (next) recipients = [toRecipient(next)];
      else if (!walk.some((d) => d.managers)) {
        // End of the list (or nobody covers now): the farm's managers, once, then stop.
        recipients = (await this.onCall.managers(a.farmId)).filter((m) => !told.has(m.id)).map(toRecipient);
        managers = true;
        stop = true;
      } else stop = true;
      if (!recipients.length) stop = true;
      type = continuing ? 'escalated' : 'notified';
      details = { step: p.step, walk: true, walkStart, ...(managers ? { managers: true } : {}), recipients };
    }

    const kind = type === 'escalated' ? 'escalation' : 'alert';
    const sent: string[] = [];
    const failed: Array<{ email: string; error: string }> = [];
    for (const r of recipients) {
      const mail = this.compose(a, farm, r, p, kind);
      try {
        await this.notifications.send({ farmId: a.farmId, kind, to: r.email, subject: mail.subject, text: mail.text, relatedId: a.id });
        sent.push(r.email);
      } catch (err) {
        failed.push({ email: r.email, error: err instanceof Error ? err.message : String(err) });
      }
    }
    // Nobody reached although someone was meant to be: fail the job so BullMQ retries it (nothing was sent twice).
    if (recipients.length && !sent.length) throw new Error(`alert e-mail not delivered: ${failed.map((f) => f.error).join('; ')}`);
    await this.repo.addEvent({
      alertId: a.id,
      type,
      userId: null,
      details: { ...details, reason: p.reason, kind, delivered: sent, failed, ...(stop ? { stopped: true } : {}) },
      at: now,
    });
    if (stop && !direct) await this.repo.stopEscalation(a.id);
    this.logger.info({ alertId: a.id, step: p.step, reason: p.reason, sent: sent.length, stop }, 'alert notification step');
    return { sent };
  }

  private compose(a: Alert, farm: FarmInfo, r: Recipient, p: JobPayload<'notifyAlert'>, kind: 'alert' | 'escalation'): { subject: string; text: string } {
    const level = a.level === 'act' ? 'ACT' : 'Watch';
    const subject =
      p.reason === 'assigned'
        ? `[Gillwise] Assigned to you: ${a.title}`
        : p.reason === 'realert'
          ? `[Gillwise] Still open: ${a.title}`
          : kind === 'escalation'
            ? `[Gillwise] Escalated, not acknowledged after ${farm.settings.escalationMinutes} min: ${a.title}`
            : `[Gillwise] ${level}: ${a.title}`;
    const rule = a.rule as { threshold?: number | null; basis?: string | null; source?: string };
    const opened = `${localParts(a.openedAt, farm.timeZone).day} ${localHhmm(a.openedAt, farm.timeZone)} (${farm.timeZone})`;
    const url = `${this.options.publicUrl.replace(/\/$/, '')}/farms/${a.farmId}/alerts?alertId=${a.id}`;
    const lines = [
      `${r.name},`,
      '',
      a.message,
      '',
      `Farm: ${farm.name}`,
      `Level: ${level}`,
      `Opened: ${opened}`,
      rule.source ? `Rule: ${rule.threshold ?? ''}${rule.basis ? ` ${rule.basis}` : ''}${rule.threshold != null ? ' — ' : ''}${rule.source}` : null,
      '',
      `Open the alert: ${url}`,
      p.reason === 'assigned' ? 'This alert was assigned to you.' : 'Acknowledge it in Gillwise to stop the e-mails to the next person on call.',
      '',
      THRESHOLD_CAUTION,
    ].filter((l): l is string => l !== null);
    return { subject, text: lines.join('\n') };
  }
}

function toRecipient(p: OnCallPerson): Recipient {
  return { userId: p.id, name: p.name, email: p.email, position: p.position, role: p.role };
}
