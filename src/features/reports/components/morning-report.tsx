import type { MorningReportDto } from '@shared/schemas/reports.schema';
import { useQuery } from '@tanstack/react-query';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { StatusBadge } from '@/components/ui/status-badge';
import { reportQueries } from '../api/report-queries';
import { addDays, formatDay } from '../lib/day';

export interface MorningReportViewProps {
  farmId: string;
  /** The farm-local day, or null for today's. */
  day: string | null;
  onDay: (day: string | null) => void;
  unitHref: (unitId: string) => string;
  alertsHref: string;
}

type Alarm = MorningReportDto['content']['alarms'][number];

/** The night's alarms, one group per kind and level, act before watch, in the order they opened. */
function alarmGroups(alarms: readonly Alarm[]): Array<{ kind: Alarm['kind']; level: Alarm['level']; alarms: Alarm[] }> {
  const groups = new Map<string, { kind: Alarm['kind']; level: Alarm['level']; alarms: Alarm[] }>();
  for (const a of [...alarms].sort((x, y) => Date.parse(x.openedAt) - Date.parse(y.openedAt))) {
    const key = `${a.level}:${a.kind}`;
    const g = groups.get(key) ?? { kind: a.kind, level: a.level, alarms: [] };
    g.alarms.push(a);
    groups.set(key, g);
  }
  return [...groups.values()].sort((x, y) => (x.level === y.level ? 0 : x.level === 'act' ? -1 : 1));
}

function fmt(value: number, decimals: number, locale: string) {
  return new Intl.NumberFormat(locale, { minimumFractionDigits: decimals, maximumFractionDigits: decimals }).format(value);
}

/** DO 0–10 mg/L drawn as a bar, so the lowest night stands out at a glance. */
function DoBar({ doMgL }: { doMgL: number }) {
  const pct = Math.max(2, Math.min(100, (doMgL / 10) * 100));
  return (
    <span className="relative block h-2.5 w-full max-w-40 overflow-hidden rounded-full bg-abyss-50" aria-hidden="true">
      <span className="absolute inset-y-0 left-0 rounded-full bg-abyss-600" style={{ width: `${pct}%` }} />
    </span>
  );
}

/** The night just past: lowest oxygen per unit, aerators, alarms and who took them, missed checks. */
export function MorningReportView({ farmId, day, onDay, unitHref, alertsHref }: MorningReportViewProps) {
  const { t, i18n } = useTranslation();
  const locale = i18n.language;
  const report = useQuery(reportQueries.morning(farmId, day));

  if (report.isPending) return <Spinner label={t('reports.loading')} />;
  if (report.isError) {
    return (
      <Callout tone="danger" title={t('reports.loadFailed')}>
        <Button variant="secondary" className="mt-2" onClick={() => void report.refetch()}>
          {t('common.retry')}
        </Button>
      </Callout>
    );
  }
  const r: MorningReportDto = report.data;
  const c = r.content;
  const farmToday = new Intl.DateTimeFormat('en-CA', { timeZone: c.timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(
    new Date(),
  );
  const today = r.day >= farmToday;
  const go = (d: string) => onDay(d >= farmToday ? null : d);
  const units = [...c.units].sort((a, b) => (a.lowestDo?.doMgL ?? Infinity) - (b.lowestDo?.doMgL ?? Infinity));
  const unacked = c.alarms.filter((a) => !a.acknowledgedAt && a.state !== 'resolved').length;

  return (
    <div className={cx('flex flex-col gap-6', report.isPlaceholderData && 'opacity-60')} data-testid="morning-report" data-day={r.day}>
      <nav aria-label={t('reports.dayNav')} className="grid grid-cols-[auto_1fr_auto] items-center gap-2">
        <Button
          variant="secondary"
          size="icon"
          className="gap-2 sm:px-4"
          onClick={() => go(addDays(r.day, -1))}
          aria-label={t('reports.previous')}
        >
          <Icon name="arrowRight" className="rotate-180" />
          <span className="hidden sm:inline">{t('reports.previous')}</span>
        </Button>
        <p className="min-w-0 text-center text-lg font-bold leading-tight sm:text-xl" aria-live="polite">
          {formatDay(r.day, locale)}
        </p>
        <Button
          variant="secondary"
          size="icon"
          className="gap-2 sm:px-4"
          onClick={() => go(addDays(r.day, 1))}
          disabled={today}
          aria-label={t('reports.next')}
        >
          <span className="hidden sm:inline">{t('reports.next')}</span>
          <Icon name="arrowRight" />
        </Button>
      </nav>

      <section className="gw-card px-5 py-4" aria-labelledby="report-night">
        <h2 id="report-night" className="text-xl font-bold">
          {t('reports.night', { dusk: c.night.duskLocalTime, dawn: c.night.dawnLocalTime })}
        </h2>
        <p className="mt-1 text-base text-muted">
          {r.stored
            ? r.mailedTo.length
              ? t('reports.storedMailed', { count: r.mailedTo.length, people: r.mailedTo.join(', ') })
              : t('reports.stored')
            : t('reports.preview')}
        </p>
        <ul className="mt-3 grid gap-2 sm:grid-cols-3 sm:gap-3" data-testid="report-kpis">
          {[
            { key: 'alarms', value: c.alarms.length, alarm: false },
            { key: 'unacked', value: unacked, alarm: unacked > 0 },
            { key: 'missed', value: c.missedChecks.testsOverdue.length + c.missedChecks.silentProbes.length, alarm: false },
          ].map((k) => (
            <li
              key={k.key}
              className={cx(
                // Phones: the number then its words on one line; wider screens: a tile with the words above.
                'flex items-baseline gap-2 rounded-xl border-2 px-3 py-1.5 sm:flex-col-reverse sm:items-start sm:gap-0 sm:py-2',
                k.alarm ? 'border-act bg-act-soft text-act-ink' : 'border-line bg-paper',
              )}
            >
              <span className="text-2xl font-bold tabular-nums">
                {k.alarm ? <span aria-hidden="true">◆ </span> : null}
                {k.value}
              </span>
              <span className={cx('text-base font-bold leading-tight sm:text-sm', !k.alarm && 'text-muted')}>
                {t(`reports.kpi.${k.key}`)}
              </span>
            </li>
          ))}
        </ul>
      </section>

      <section aria-labelledby="report-do" className="flex flex-col gap-3">
        <h2 id="report-do" className="text-xl font-bold">
          {t('reports.do.title')}
        </h2>
        <p className="text-base text-muted">{t('reports.do.intro')}</p>
        <div className="overflow-x-auto rounded-xl border-2 border-line bg-card">
          <table className="w-full border-collapse text-base">
            <caption className="sr-only">{t('reports.do.title')}</caption>
            <thead className="bg-abyss-50 text-left">
              <tr>
                <th scope="col" className="border-b-2 border-line px-3 py-2.5">
                  {t('reports.do.unit')}
                </th>
                <th scope="col" className="border-b-2 border-line px-3 py-2.5 text-right">
                  {t('reports.do.lowest')}
                </th>
                <th scope="col" className="hidden border-b-2 border-line px-3 py-2.5 sm:table-cell">
                  <span className="sr-only">{t('reports.do.bar')}</span>
                </th>
                <th scope="col" className="border-b-2 border-line px-3 py-2.5 text-right">
                  {t('reports.do.aerator')}
                </th>
              </tr>
            </thead>
            <tbody>
              {units.map((u) => (
                <tr key={u.unitId} className="border-b border-line last:border-b-0 even:bg-paper">
                  <th scope="row" className="px-3 py-2 text-left font-normal">
                    <Link to={unitHref(u.unitId)} className="gw-link">
                      {u.code}
                    </Link>{' '}
                    <span className="text-muted">{u.name}</span>
                  </th>
                  <td className="px-3 py-2 text-right tabular-nums">
                    {u.lowestDo ? (
                      <>
                        <span className="font-bold">{fmt(u.lowestDo.doMgL, 1, locale)} mg/L</span>
                        <span className="block text-sm text-muted">
                          {t(`reports.do.source.${u.lowestDo.source}`, { time: u.lowestDo.localTime })}
                        </span>
                      </>
                    ) : (
                      <span className="text-muted">{t('reports.do.none')}</span>
                    )}
                  </td>
                  <td className="hidden w-44 px-3 py-2 sm:table-cell">{u.lowestDo ? <DoBar doMgL={u.lowestDo.doMgL} /> : null}</td>
                  <td className="px-3 py-2 text-right tabular-nums">
                    {u.aeratorHours === null ? '—' : t('reports.do.hours', { hours: fmt(u.aeratorHours, 1, locale) })}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>

      <section aria-labelledby="report-alarms" className="flex flex-col gap-3">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="report-alarms" className="text-xl font-bold">
            {t('reports.alarms.title')}
          </h2>
          <Link to={alertsHref} className="gw-link">
            {t('reports.alarms.all')}
          </Link>
        </div>
        {c.alarms.length === 0 ? (
          <p className="rounded-xl border-2 border-clear bg-clear-soft px-4 py-3 font-bold text-clear-ink">
            <span aria-hidden="true">● </span>
            {t('reports.alarms.none')}
          </p>
        ) : (
          <ul className="flex flex-col gap-2" data-testid="report-alarms">
            {alarmGroups(c.alarms).map((g) => {
              const acked = g.alarms.filter((a) => a.acknowledgedBy);
              const waiting = g.alarms.filter((a) => !a.acknowledgedBy && a.state !== 'resolved').length;
              const names = [...new Set(acked.map((a) => a.acknowledgedBy!.name))].join(', ');
              const opened = [...new Set(g.alarms.map((a) => a.openedLocalTime))];
              return (
                <li key={`${g.kind}-${g.level}`} className="gw-card flex flex-wrap items-start gap-3 px-4 py-3" data-alarm-kind={g.kind}>
                  <StatusBadge status={g.level} size="sm" className="mt-0.5" />
                  <div className="min-w-0 flex-1">
                    <p className="font-bold">
                      {t(`alerts.kind.${g.kind}`, { defaultValue: g.alarms[0]!.title })}
                      {g.alarms.length > 1 ? <span className="font-normal text-muted"> ({g.alarms.length})</span> : null}
                    </p>
                    <p className="text-base">
                      {[...new Set(g.alarms.map((a) => a.unitCode ?? t('reports.alarms.farm')))].join(', ')}
                      <span className="text-muted">
                        {' · '}
                        {opened.length === 1
                          ? t('reports.alarms.opened', { time: opened[0] })
                          : t('reports.alarms.openedBetween', { from: opened[0], to: opened[opened.length - 1] })}
                      </span>
                    </p>
                    <p className="text-base">
                      {acked.length ? t('reports.alarms.ackBy', { count: acked.length, total: g.alarms.length, names }) : null}
                      {acked.length && waiting ? ' · ' : null}
                      {waiting ? (
                        <strong className="text-act-ink">
                          <span aria-hidden="true">◆ </span>
                          {g.alarms.length === 1 ? t('reports.alarms.unacked') : t('reports.alarms.unackedCount', { count: waiting })}
                        </strong>
                      ) : null}
                      {!acked.length && !waiting ? t('reports.alarms.resolvedUnacked') : null}
                    </p>
                  </div>
                </li>
              );
            })}
          </ul>
        )}
      </section>

      <section aria-labelledby="report-missed" className="flex flex-col gap-3">
        <h2 id="report-missed" className="text-xl font-bold">
          {t('reports.missed.title')}
        </h2>
        {c.missedChecks.testsOverdue.length + c.missedChecks.silentProbes.length === 0 ? (
          <p className="text-base text-muted">{t('reports.missed.none')}</p>
        ) : (
          <ul className="flex flex-col gap-2">
            {c.missedChecks.testsOverdue.map((m) => (
              <li key={m.alertId} className="flex items-start gap-2 text-base">
                <span aria-hidden="true" className="font-bold text-watch">
                  ▲
                </span>
                <span>
                  <Link to={unitHref(m.unitId)} className="gw-link">
                    {m.code}
                  </Link>{' '}
                  {m.dueDay ? t('reports.missed.testDue', { day: formatDay(m.dueDay, locale) }) : t('reports.missed.testNever')}
                </span>
              </li>
            ))}
            {c.missedChecks.silentProbes.map((p) => (
              <li key={p.alertId} className="flex items-start gap-2 text-base">
                <span aria-hidden="true" className="font-bold text-silent">
                  ○
                </span>
                <span>
                  {t('reports.missed.silent', { probe: p.label, unit: p.unitCode ?? '—' })}
                  {p.resolvedAt ? ` ${t('reports.missed.backAgain')}` : ''}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>

      <Callout tone="caution" title={t('cautions.title')}>
        {t('cautions.thresholds')}
      </Callout>
    </div>
  );
}
