import type { RationSheetDto } from '@shared/schemas/feed.schema';
import type { Task } from '@shared/schemas/treatments.schema';
import { useQuery } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { statusStyle } from '@/components/ui/status-badge';
import { taskQueries } from '../api/tasks';

function dayTitle(day: string, locale: string): string {
  try {
    // The farm day is a calendar date: format it as that date, whatever the viewer's time zone.
    const text = new Intl.DateTimeFormat(locale, { timeZone: 'UTC', weekday: 'long', day: 'numeric', month: 'long' }).format(
      new Date(`${day}T12:00:00Z`),
    );
    return text.charAt(0).toLocaleUpperCase(locale) + text.slice(1);
  } catch {
    return day;
  }
}

function shortDay(day: string, locale: string): string {
  try {
    return new Intl.DateTimeFormat(locale, { timeZone: 'UTC', weekday: 'short', day: 'numeric', month: 'short' }).format(
      new Date(`${day}T12:00:00Z`),
    );
  } catch {
    return day;
  }
}

function when(iso: string, timeZone: string, locale: string): string {
  try {
    return new Intl.DateTimeFormat(locale, {
      timeZone,
      weekday: 'short',
      day: 'numeric',
      month: 'short',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
    }).format(new Date(iso));
  } catch {
    return iso;
  }
}

const kg = (v: number, locale: string) => new Intl.NumberFormat(locale, { maximumFractionDigits: 1 }).format(v);

/** Why the test is due, in the crew's words (the schedule rule of the task). */
function reasonKey(task: Task): string {
  if (task.state === 'cycling') return 'tasks.reason.cycling';
  if (task.everyDays === 1) return 'tasks.reason.closeWatch';
  return 'tasks.reason.every';
}

function TaskCard({ task, href, timeZone }: { task: Task; href: string; timeZone: string }) {
  const { t, i18n } = useTranslation();
  const overdue = task.status === 'overdue';
  const style = statusStyle[overdue ? 'act' : 'watch'];
  return (
    <Link
      to={href}
      data-task-unit={task.code}
      data-task-status={task.status}
      className={cx(
        'flex min-h-20 items-center gap-3 rounded-2xl border-2 border-l-[10px] bg-card px-3 py-3 hover:bg-abyss-50',
        overdue ? 'border-act' : 'border-watch',
      )}
    >
      <span className="grid min-w-16 place-items-center rounded-xl bg-abyss-800 px-2 py-3 text-2xl font-bold text-white">{task.code}</span>
      <span className="min-w-0 flex-1">
        <span
          className={cx(
            'inline-flex items-center gap-1.5 rounded-full border-2 px-2.5 py-0.5 text-sm font-bold leading-tight',
            style.className,
          )}
        >
          <span aria-hidden="true">{style.glyph}</span>
          {overdue ? t('tasks.overdue', { count: task.daysOverdue }) : t('tasks.dueToday')}
        </span>
        <span className="mt-1 block text-lg font-bold leading-snug text-ink">{task.name}</span>
        <span className="block text-sm text-muted">
          {t(reasonKey(task), { count: task.everyDays })}
          {' · '}
          {task.lastTestAt ? t('tasks.lastTest', { when: when(task.lastTestAt, timeZone, i18n.language) }) : t('tasks.neverTested')}
        </span>
      </span>
      <span className="flex shrink-0 flex-col items-center text-abyss-800">
        <Icon name="tube" size={26} />
        <span className="text-sm font-bold">{t('tasks.test')}</span>
      </span>
    </Link>
  );
}

function RationSheet({ sheet }: { sheet: RationSheetDto }) {
  const { t, i18n } = useTranslation();
  const lang = i18n.language;
  const rows = [...sheet.rows].sort((a, b) => a.unit.walkOrder - b.unit.walkOrder);
  const undecided = rows.filter((r) => r.toFeedKg === null && !(r.action === 'withhold' || r.withheld === true)).length;
  return (
    <section aria-labelledby="ration-title" className="flex flex-col gap-3" data-testid="ration-sheet">
      <h2 id="ration-title" className="flex items-center gap-2 text-2xl font-bold">
        <Icon name="scoop" /> {t('tasks.rations.title')}
      </h2>
      {rows.length === 0 ? <p className="text-lg text-muted">{t('tasks.rations.none')}</p> : null}
      {undecided ? (
        <p
          className="flex items-start gap-2 rounded-xl border-2 border-ember-600 bg-ember-50 px-4 py-3 text-base font-bold"
          data-testid="rations-waiting"
        >
          <span aria-hidden="true">◔</span>
          {undecided === rows.length ? t('tasks.rations.allWaiting') : t('tasks.rations.someWaiting', { count: undecided })}
        </p>
      ) : null}
      <ul className="gw-card flex flex-col divide-y-2 divide-line">
        {rows.map((r) => {
          const withhold = r.action === 'withhold' || r.withheld === true;
          const decided = r.toFeedKg !== null;
          return (
            <li key={r.unit.id} className="flex flex-col gap-1 px-4 py-3" data-ration-unit={r.unit.code}>
              <div className="flex items-center justify-between gap-3">
                <p className="min-w-0 leading-snug">
                  <span className="text-lg font-bold">{r.unit.code}</span> <span className="text-muted">{r.unit.name}</span>
                </p>
                <p className="shrink-0 text-right text-2xl font-bold tabular-nums">
                  {withhold ? (
                    <span className="inline-flex items-center gap-1.5 text-xl text-act">
                      <span aria-hidden="true">◆</span>
                      {t('tasks.rations.withhold')}
                    </span>
                  ) : decided ? (
                    t('tasks.rations.kg', { kg: kg(r.toFeedKg ?? 0, lang) })
                  ) : (
                    <span className="block text-base font-bold text-muted">
                      {r.plannedKg !== null ? t('tasks.rations.planned', { kg: kg(r.plannedKg, lang) }) : '—'}
                    </span>
                  )}
                </p>
              </div>
              {r.action === 'cut' && decided ? (
                <p className="flex items-center gap-1.5 text-base font-bold text-watch-ink">
                  <span aria-hidden="true">▲</span>
                  {t('tasks.rations.cut', { planned: kg(r.plannedKg ?? 0, lang) })}
                </p>
              ) : null}
              {r.reasons.length ? (
                <ul className="list-disc pl-5 text-sm text-muted">
                  {r.reasons.map((reason) => (
                    <li key={reason.code}>{reason.text}</li>
                  ))}
                </ul>
              ) : null}
              {r.fedKg !== null ? (
                <p className="text-sm font-bold text-clear-ink">● {t('tasks.rations.fed', { kg: kg(r.fedKg, lang) })}</p>
              ) : null}
            </li>
          );
        })}
      </ul>
      <p className="text-sm text-muted">{t('cautions.recommendations')}</p>
    </section>
  );
}

export interface TaskBoardProps {
  farmId: string;
  timeZone: string;
  /** Where "test" goes for a unit: the pondside form for that unit. */
  testHref: (unitId: string) => string;
  nightRoundHref: string;
  /** Entries still on this phone (composed in by the route). */
  outbox?: ReactNode;
}

/** The hand's landing page: which tests are due or overdue today, and what to feed. */
export function TaskBoard({ farmId, timeZone, testHref, nightRoundHref, outbox }: TaskBoardProps) {
  const { t, i18n } = useTranslation();
  const lang = i18n.language;
  const tests = useQuery(taskQueries.tests(farmId));
  const rations = useQuery(taskQueries.rations(farmId));
  const due = tests.data?.tests.filter((x) => x.status !== 'upcoming') ?? [];
  const upcoming = tests.data?.tests.filter((x) => x.status === 'upcoming') ?? [];
  const overdue = due.filter((x) => x.status === 'overdue').length;

  return (
    <div className="flex flex-col gap-7" data-testid="task-board">
      <title>{`${t('nav.tasks')} · Gillwise`}</title>
      <header className="flex flex-col gap-1">
        <h1 className="text-3xl font-bold leading-tight">{t('tasks.title')}</h1>
        {tests.data ? <p className="text-lg font-bold text-abyss-700">{dayTitle(tests.data.day, lang)}</p> : null}
      </header>

      {outbox}

      <section aria-labelledby="tests-title" className="flex flex-col gap-3">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="tests-title" className="text-2xl font-bold">
            {t('tasks.testsTitle')}
          </h2>
          {tests.data && due.length ? (
            <p className="text-base font-bold" data-testid="task-summary">
              {overdue ? <span className="text-act">◆ {t('tasks.summaryOverdue', { count: overdue })}</span> : null}
              {overdue && due.length - overdue ? ' · ' : null}
              {due.length - overdue ? (
                <span className="text-watch-ink">▲ {t('tasks.summaryDue', { count: due.length - overdue })}</span>
              ) : null}
            </p>
          ) : null}
        </div>
        {tests.isPending ? (
          <p className="flex items-center gap-3 text-lg" role="status">
            <Spinner /> {t('common.loading')}
          </p>
        ) : tests.isError ? (
          <Callout tone="danger" title={t('tasks.failed')}>
            <Button variant="secondary" onClick={() => void tests.refetch()}>
              {t('common.retry')}
            </Button>
          </Callout>
        ) : due.length === 0 ? (
          <p
            className="flex items-center gap-3 rounded-2xl border-2 border-clear bg-clear-soft px-4 py-4 text-lg font-bold text-clear-ink"
            data-testid="no-tests-due"
          >
            <span aria-hidden="true">●</span>
            {t('tasks.allDone')}
          </p>
        ) : (
          <ul className="flex flex-col gap-2">
            {due.map((task) => (
              <li key={task.unitId}>
                <TaskCard task={task} href={testHref(task.unitId)} timeZone={timeZone} />
              </li>
            ))}
          </ul>
        )}
        {upcoming.length ? (
          <details className="gw-card px-4 py-2">
            <summary className="flex min-h-12 cursor-pointer items-center text-lg font-bold">
              {t('tasks.upcoming', { count: upcoming.length })}
            </summary>
            <ul className="flex flex-col divide-y divide-line pb-2">
              {upcoming.map((task) => (
                <li key={task.unitId}>
                  <Link to={testHref(task.unitId)} className="flex min-h-12 items-center gap-3 py-2 hover:bg-abyss-50">
                    <span className="w-12 text-lg font-bold">{task.code}</span>
                    <span className="min-w-0 flex-1 truncate">{task.name}</span>
                    <span className="text-sm text-muted">{t('tasks.nextOn', { day: shortDay(task.dueDay, lang) })}</span>
                  </Link>
                </li>
              ))}
            </ul>
          </details>
        ) : null}
      </section>

      <Link
        to={nightRoundHref}
        className="flex min-h-20 items-center gap-4 rounded-2xl bg-abyss-900 px-4 py-4 text-white hover:bg-abyss-800"
      >
        <Icon name="moon" size={32} className="text-ember-300" />
        <span className="min-w-0 flex-1">
          <span className="block text-xl font-bold">{t('tasks.nightRound')}</span>
          <span className="block text-base text-abyss-100">{t('tasks.nightRoundHint')}</span>
        </span>
        <Icon name="arrowRight" />
      </Link>

      {rations.data ? (
        <RationSheet sheet={rations.data} />
      ) : rations.isPending ? null : rations.isError ? (
        <Callout tone="caution" title={t('tasks.rations.title')}>
          {t('tasks.rations.failed')}
        </Callout>
      ) : null}
    </div>
  );
}
