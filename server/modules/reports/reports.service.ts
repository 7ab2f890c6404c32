import { localParts } from '../../../shared/farm-time';
import type { AlertDto } from '../../../shared/schemas/alerts.schema';
import type { MorningReportContent, MorningReportDto } from '../../../shared/schemas/reports.schema';
import { THRESHOLD_CAUTION } from '../../../shared/schemas/thresholds.schema';
import type { MorningReport } from '../../db/entities';
import { notFound } from '../../http/errors';
import type { Logger } from '../../lib/logger';
import { localHhmm, nightEndingOn } from '../alerts/alert-rules';
import type { AlertsService } from '../alerts/alerts.service';
import type { FarmDirectory, FarmInfo } from '../alerts/ports';
import type { NotificationsService } from '../notifications/notifications.service';
import type { OnCallService } from '../on-call/on-call.service';
import type { UnitsService } from '../units/units.service';
import { presentReport } from './reports.presenter';
import type { ReportsRepository } from './reports.repository';

const round1 = (v: number) => Math.round(v * 10) / 10;
const minutesOf = (hhmm: string) => {
  const [h, m] = hhmm.split(':').map(Number) as [number, number];
  return h * 60 + m;
};

/**
 * The morning report: per farm and farm-local day, built at morningReportLocalTime from the night before
 * (the previous dusk to this dawn): lowest DO per unit with its time, aerator hours, alarms opened and
 * who acknowledged them, missed checks. Stored once (unique farm + day) and e-mailed once to the managers.
 */
export class ReportsService {
  constructor(
    private readonly repo: ReportsRepository,
    private readonly alerts: Pick<AlertsService, 'nightAlerts'>,
    private readonly units: Pick<UnitsService, 'list'>,
    private readonly onCall: Pick<OnCallService, 'managers'>,
    private readonly notifications: Pick<NotificationsService, 'send'>,
    private readonly farms: FarmDirectory,
    private readonly logger: Logger,
  ) {}

  private async farmOrThrow(farmId: string): Promise<FarmInfo> {
    const farm = await this.farms.farm(farmId);
    if (!farm) throw notFound('Farm');
    return farm;
  }

  /** Builds the content for a farm-local day (nothing stored). */
  async build(farmId: string, day: string, now = new Date()): Promise<MorningReportContent> {
    const farm = await this.farmOrThrow(farmId);
    const tz = farm.timeZone;
    const { duskAt, dawnAt } = nightEndingOn(day, tz, farm.settings.duskLocalTime, farm.settings.dawnLocalTime);
    // Alarms and missed checks up to the report time (or now, for a preview before it).
    const until = new Date(Math.max(dawnAt.getTime(), Math.min(now.getTime(), dawnAt.getTime() + 18 * 3600_000)));
    const [units, probeDo, spotDo, aerators, night] = await Promise.all([
      this.units.list(farmId),
      this.repo.lowestProbeDo(farmId, duskAt, dawnAt),
      this.repo.lowestSpotDo(farmId, duskAt, dawnAt),
      this.repo.aeratorHours(farmId, duskAt, dawnAt),
      this.alerts.nightAlerts(farmId, duskAt, until),
    ]);
    const active = units.filter((u) => u.state !== 'fallow');
    const unitRows: MorningReportContent['units'] = active.map((u) => {
      const p = probeDo.get(u.id);
      const s = spotDo.get(u.id);
      const lowest =
        p && (!s || p.doMgL <= s.doMgL)
          ? { doMgL: p.doMgL, at: p.at, source: 'probe' as const }
          : s
            ? { doMgL: s.doMgL, at: s.at, source: 'spot_test' as const }
            : null;
      const hours = aerators.get(u.id);
      return {
        unitId: u.id,
        code: u.code,
        name: u.name,
        kind: u.kind,
        lowestDo: lowest ? { doMgL: Math.round(lowest.doMgL * 100) / 100, at: lowest.at.toISOString(), localTime: localHhmm(lowest.at, tz), source: lowest.source } : null,
        aeratorHours: hours === undefined ? null : round1(hours),
      };
    });
    const byCode = new Map(units.map((u) => [u.id, u.code]));
    const alarm = (a: AlertDto) => ({
      alertId: a.id,
      kind: a.kind,
      level: a.level,
      state: a.state,
      unitId: a.unitId,
      unitCode: a.unitCode,
      title: a.title,
      openedAt: a.openedAt,
      openedLocalTime: localHhmm(new Date(a.openedAt), tz),
      acknowledgedBy: a.acknowledgedBy,
      acknowledgedAt: a.acknowledgedAt,
      resolvedAt: a.resolvedAt,
    });
    return {
      timeZone: tz,
      night: { from: duskAt.toISOString(), to: dawnAt.toISOString(), duskLocalTime: farm.settings.duskLocalTime, dawnLocalTime: farm.settings.dawnLocalTime },
      units: unitRows,
      aerators: unitRows.filter((u) => (u.aeratorHours ?? 0) > 0).map((u) => ({ unitId: u.unitId, code: u.code, hours: u.aeratorHours as number })),
      alarms: night.opened.map(alarm),
      missedChecks: {
        testsOverdue: night.overdueTests.map((a) => ({
          unitId: a.unitId as string,
          code: a.unitCode ?? byCode.get(a.unitId ?? '') ?? '',
          alertId: a.id,
          dueDay: typeof a.values.dueDay === 'string' ? a.values.dueDay : null,
          lastTestAt: typeof a.values.lastTestAt === 'string' ? a.values.lastTestAt : null,
        })),
        silentProbes: night.silentProbes.map((a) => ({ probeId: a.probeId as string, label: a.probeLabel ?? 'probe', unitCode: a.unitCode, alertId: a.id, since: a.openedAt, resolvedAt: a.resolvedAt })),
      },
      caution: THRESHOLD_CAUTION,
    };
  }

  /** The stored report of a day, or a preview built now when there is none yet (stored: false). */
  async get(farmId: string, day: string | undefined, now = new Date()): Promise<MorningReportDto> {
    const farm = await this.farmOrThrow(farmId);
    const d = day ?? localParts(now, farm.timeZone).day;
    const stored = await this.repo.find(farmId, d);
    if (stored) return presentReport(stored);
    return { id: null, farmId, day: d, stored: false, createdAt: now.toISOString(), mailedTo: [], content: await this.build(farmId, d, now) };
  }

  async list(farmId: string, limit: number) {
    await this.farmOrThrow(farmId);
    const rows = await this.repo.list(farmId, limit);
    return rows.map((r) => {
      const dto = presentReport(r);
      return { id: r.id, day: dto.day, createdAt: dto.createdAt, alarms: dto.content.alarms.length, mailedTo: dto.mailedTo };
    });
  }

  /** Farms whose report for their local today is due (local time past morningReportLocalTime) and not yet stored and mailed. */
  async dueFarms(now = new Date()): Promise<Array<{ farmId: string; day: string }>> {
    const due: Array<{ farmId: string; day: string }> = [];
    for (const farm of await this.farms.allFarms()) {
      const p = localParts(now, farm.timeZone);
      if (p.hour * 60 + p.minute < minutesOf(farm.settings.morningReportLocalTime)) continue;
      const stored = await this.repo.find(farm.id, p.day);
      if (stored && Array.isArray(stored.content.mailedTo)) continue;
      due.push({ farmId: farm.id, day: p.day });
    }
    return due;
  }

  /**
   * The morning-report job for one farm: stores the day's report once and e-mails it once to the
   * managers (kind 'digest'). Running it again changes nothing.
   */
  async buildAndSend(farmId: string, day?: string, now = new Date()): Promise<{ day: string; created: boolean; mailedTo: string[] }> {
    const farm = await this.farmOrThrow(farmId);
    const d = day ?? localParts(now, farm.timeZone).day;
    let report = await this.repo.find(farmId, d);
    let created = false;
    if (!report) {
      const content = await this.build(farmId, d, now);
      ({ report, created } = await this.repo.insertOnce({ farmId, day: d, content: content as unknown as Record<string, unknown>, createdAt: now }));
    }
    const mailedTo = await this.mail(farm, report, now);
    return { day: d, created, mailedTo };
  }

  private async mail(farm: FarmInfo, report: MorningReport, now: Date): Promise<string[]> {
    if (Array.isArray(report.content.mailedTo)) return report.content.mailedTo as string[];
    if (!(await this.repo.claimMailing(report.id, now))) return [];
    try {
      const managers = await this.onCall.managers(farm.id);
      const dto = presentReport(report);
      const text = reportText(farm, dto);
      const sent: string[] = [];
      for (const m of managers) {
        await this.notifications.send({ farmId: farm.id, kind: 'digest', to: m.email, subject: `[Gillwise] Morning report ${dto.day}: ${farm.name}`, text, relatedId: report.id });
        sent.push(m.email);
      }
      await this.repo.markMailed(report.id, sent);
      this.logger.info({ farmId: farm.id, day: report.day, to: sent.length }, 'morning report mailed');
      return sent;
    } catch (err) {
      await this.repo.releaseMailing(report.id);
      throw err;
    }
  }
}

function reportText(farm: FarmInfo, r: MorningReportDto): string {
  const c = r.content;
  const lines: string[] = [`Morning report for ${farm.name}, ${r.day}`, `Night: ${c.night.duskLocalTime} to ${c.night.dawnLocalTime} (${c.timeZone})`, ''];
  lines.push('Lowest dissolved oxygen overnight:');
  for (const u of c.units) {
    lines.push(`  ${u.code} ${u.name}: ${u.lowestDo ? `${u.lowestDo.doMgL} mg/L at ${u.lowestDo.localTime} (${u.lowestDo.source === 'probe' ? 'probe' : 'night round'})` : 'no DO reading'}`);
  }
  lines.push('', 'Aerators that ran:');
  if (!c.aerators.length) lines.push('  none');
  for (const a of c.aerators) lines.push(`  ${a.code}: ${a.hours} h`);
  lines.push('', 'Alarms opened since dusk:');
  if (!c.alarms.length) lines.push('  none');
  for (const a of c.alarms) {
    lines.push(`  ${a.openedLocalTime} ${a.level.toUpperCase()} ${a.title} — ${a.acknowledgedBy ? `acknowledged by ${a.acknowledgedBy.name}` : 'not acknowledged'}${a.resolvedAt ? ', resolved' : ''}`);
  }
  lines.push('', 'Missed checks:');
  if (!c.missedChecks.testsOverdue.length && !c.missedChecks.silentProbes.length) lines.push('  none');
  for (const t of c.missedChecks.testsOverdue) lines.push(`  ${t.code}: routine ammonia test overdue${t.dueDay ? ` (due ${t.dueDay})` : ''}`);
  for (const p of c.missedChecks.silentProbes) lines.push(`  ${p.label}${p.unitCode ? ` (${p.unitCode})` : ''}: silent${p.resolvedAt ? ', reporting again' : ''}`);
  lines.push('', c.caution);
  return lines.join('\n');
}
