import type { RationSheetDto } from '@shared/schemas/feed.schema';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Dialog } from '@/components/ui/dialog';
import { EmptyState } from '@/components/ui/empty-state';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { useAcceptDay, useAcceptRecommendation, useRecompute } from '../api/ration-mutations';
import { rationQueries } from '../api/ration-queries';
import { addDays, fmtKg, formatDay } from '../lib/format';
import { OverrideForm, type OverrideTarget } from './override-form';
import { RationCard } from './ration-card';
import { RationSheet } from './ration-sheet';

export type RationView = 'plan' | 'sheet';

export interface RationsScreenProps {
  farmId: string;
  farmName: string;
  timeZone: string;
  /** Farm-local day, or null for the farm's today. */
  day: string | null;
  onDay: (day: string | null) => void;
  view: RationView;
  onView: (view: RationView) => void;
  unitHref: (unitId: string) => string;
  /** planner, manager and admin decide; everyone else reads. */
  canDecide: boolean;
}

function Totals({ sheet }: { sheet: RationSheetDto }) {
  const { t, i18n } = useTranslation();
  const l = i18n.language;
  const items = [
    { key: 'planned', value: `${fmtKg(sheet.totals.plannedKg, l)} kg` },
    { key: 'recommended', value: `${fmtKg(sheet.totals.recommendedKg, l)} kg` },
    { key: 'approved', value: `${fmtKg(sheet.totals.approvedKg, l)} kg` },
    { key: 'pending', value: String(sheet.totals.pending), warn: sheet.totals.pending > 0 },
  ];
  return (
    <ul className="grid grid-cols-2 gap-3 lg:grid-cols-4" data-testid="ration-totals">
      {items.map((i) => (
        <li key={i.key} className={cx('rounded-xl border-2 px-3 py-2', i.warn ? 'border-ember-500 bg-ember-50' : 'border-line bg-card')}>
          <span className="block text-sm font-bold text-muted">{t(`rations.totals.${i.key}`)}</span>
          <span className="block text-2xl font-bold tabular-nums">{i.value}</span>
        </li>
      ))}
    </ul>
  );
}

/** The planner's day: every unit's ration and the rule's proposal, decided one by one or together; and the hands' sheet. */
export function RationsScreen({ farmId, farmName, timeZone, day, onDay, view, onView, unitHref, canDecide }: RationsScreenProps) {
  const { t, i18n } = useTranslation();
  const locale = i18n.language;
  const query = useQuery({ ...rationQueries.sheet(farmId, day), placeholderData: keepPreviousData });
  const accept = useAcceptRecommendation(farmId);
  const acceptDay = useAcceptDay(farmId);
  const recompute = useRecompute(farmId);
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const [overriding, setOverriding] = useState<OverrideTarget | null>(null);
  const [confirmBulk, setConfirmBulk] = useState(false);
  const [acceptingId, setAcceptingId] = useState<string | null>(null);

  const sheet = query.data;
  const rows = useMemo(() => [...(sheet?.rows ?? [])].sort((a, b) => a.unit.walkOrder - b.unit.walkOrder), [sheet]);
  const pendingRows = rows.filter((r) => r.status === 'pending' && r.recommendation);
  const chosen = pendingRows.filter((r) => selected.has(r.unit.id));
  const bulkRows = chosen.length > 0 ? chosen : pendingRows;
  const missing = rows.filter((r) => !r.recommendation).length;

  if (query.isPending) return <Spinner label={t('rations.loading')} />;
  if (query.isError || !sheet) {
    return (
      <Callout tone="danger" title={t('rations.loadFailed')}>
        <p>{requestErrorText(t, query.error)}</p>
        <Button variant="secondary" className="mt-2" onClick={() => void query.refetch()}>
          {t('common.retry')}
        </Button>
      </Callout>
    );
  }

  const isToday = sheet.day === sheet.today;
  const go = (d: string) => {
    setSelected(new Set());
    onDay(d === sheet.today ? null : d);
  };
  const actionError = accept.error ?? acceptDay.error ?? recompute.error;

  return (
    <div className={cx('flex flex-col gap-5', query.isPlaceholderData && 'opacity-60')} data-testid="rations" data-day={sheet.day}>
      <nav aria-label={t('rations.dayNav')} className="gw-no-print flex flex-col gap-2">
        <div className="grid grid-cols-[auto_minmax(0,1fr)_auto] items-center gap-2">
          <Button
            variant="secondary"
            size="icon"
            className="sm:px-4"
            onClick={() => go(addDays(sheet.day, -1))}
            aria-label={t('rations.previous')}
            icon={<Icon name="arrowRight" className="rotate-180" />}
          >
            <span className="hidden sm:inline">{t('rations.previous')}</span>
          </Button>
          <p className="text-center text-lg font-bold leading-tight sm:text-xl" aria-live="polite" data-testid="ration-day">
            {formatDay(sheet.day, locale)}
            {isToday ? (
              <span className="ml-2 inline-block rounded-full bg-abyss-700 px-2 py-0.5 align-middle text-sm text-white">
                {t('rations.today')}
              </span>
            ) : null}
          </p>
          <Button
            variant="secondary"
            size="icon"
            className="sm:px-4"
            onClick={() => go(addDays(sheet.day, 1))}
            aria-label={t('rations.next')}
          >
            <span className="hidden sm:inline">{t('rations.next')}</span>
            <Icon name="arrowRight" />
          </Button>
        </div>
        {!isToday ? (
          <Button variant="ghost" className="self-center" onClick={() => go(sheet.today)}>
            {t('rations.backToToday')}
          </Button>
        ) : null}
      </nav>

      <div
        role="tablist"
        aria-label={t('rations.viewLabel')}
        className="gw-no-print inline-flex w-full rounded-xl border-2 border-abyss-700 bg-card p-1 sm:w-auto"
      >
        {(['plan', 'sheet'] as const).map((v) => (
          <button
            key={v}
            type="button"
            role="tab"
            aria-selected={view === v}
            onClick={() => onView(v)}
            className={cx(
              'min-h-11 flex-1 rounded-lg px-4 text-base font-bold sm:flex-none',
              view === v ? 'bg-abyss-700 text-white' : 'text-abyss-800 hover:bg-abyss-50',
            )}
          >
            {t(`rations.view.${v}`)}
          </button>
        ))}
      </div>

      {view === 'sheet' ? (
        <>
          <div className="gw-no-print flex flex-wrap items-center gap-3">
            <Button variant="primary" onClick={() => window.print()} icon={<Icon name="report" />}>
              {t('rations.sheet.print')}
            </Button>
            <p className="text-base text-muted">{t('rations.sheet.printHint')}</p>
          </div>
          <RationSheet sheet={sheet} farmName={farmName} />
        </>
      ) : (
        <>
          <Callout tone="caution" title={t('rations.cautionTitle')}>
            {t('rations.caution')}
          </Callout>
          <Totals sheet={sheet} />

          {actionError ? (
            <Callout tone="danger" live title={t('rations.actionFailed')}>
              {requestErrorText(t, actionError)}
            </Callout>
          ) : null}

          {canDecide ? (
            <div className="flex flex-wrap items-center gap-3" data-testid="bulk-bar">
              <Button
                variant="primary"
                disabled={pendingRows.length === 0}
                onClick={() => setConfirmBulk(true)}
                icon={<Icon name="check" />}
              >
                {chosen.length > 0
                  ? t('rations.bulk.acceptSelected', { count: chosen.length })
                  : t('rations.bulk.acceptAll', { count: pendingRows.length })}
              </Button>
              {chosen.length > 0 ? (
                <Button variant="ghost" onClick={() => setSelected(new Set())}>
                  {t('rations.bulk.clear')}
                </Button>
              ) : null}
              <Button variant="secondary" loading={recompute.isPending} onClick={() => recompute.mutate({ day: sheet.day })}>
                {t('rations.recompute')}
              </Button>
              <p className="basis-full text-sm text-muted sm:basis-auto">{t('rations.recomputeHint')}</p>
            </div>
          ) : null}

          {missing > 0 ? (
            <Callout tone="info" title={t('rations.missing.title', { count: missing })}>
              {t('rations.missing.body')}
            </Callout>
          ) : null}

          {rows.length === 0 ? (
            <EmptyState icon="scoop" title={t('rations.empty.title')}>
              {t('rations.empty.body')}
            </EmptyState>
          ) : (
            <ul className="flex flex-col gap-4" aria-label={t('rations.listLabel')}>
              {rows.map((row) => (
                <RationCard
                  key={row.unit.id}
                  row={row}
                  day={sheet.day}
                  timeZone={timeZone}
                  unitHref={unitHref(row.unit.id)}
                  canDecide={canDecide}
                  selected={selected.has(row.unit.id)}
                  onSelect={(on) =>
                    setSelected((prev) => {
                      const next = new Set(prev);
                      if (on) next.add(row.unit.id);
                      else next.delete(row.unit.id);
                      return next;
                    })
                  }
                  accepting={acceptingId === row.recommendation?.id && accept.isPending}
                  onAccept={() => {
                    if (!row.recommendation) return;
                    setAcceptingId(row.recommendation.id);
                    accept.mutate({ recommendationId: row.recommendation.id });
                  }}
                  onOverride={() => {
                    const rec = row.recommendation;
                    if (!rec) return;
                    const later = rec.laterProposal;
                    setOverriding({
                      recommendationId: rec.id,
                      unitCode: row.unit.code,
                      unitName: row.unit.name,
                      recommendedKg: later?.recommendedKg ?? rec.recommendedKg,
                      plannedKg: later?.plannedKg ?? rec.plannedKg,
                    });
                  }}
                />
              ))}
            </ul>
          )}
        </>
      )}

      <Dialog
        open={overriding !== null}
        onClose={() => setOverriding(null)}
        title={overriding ? t('rations.override.title', { unit: `${overriding.unitCode} ${overriding.unitName}` }) : ''}
      >
        {overriding ? (
          <OverrideForm
            key={overriding.recommendationId}
            farmId={farmId}
            target={overriding}
            onDone={() => setOverriding(null)}
            onCancel={() => setOverriding(null)}
          />
        ) : null}
      </Dialog>

      <Dialog
        open={confirmBulk}
        onClose={() => setConfirmBulk(false)}
        title={t('rations.bulk.confirmTitle', { count: bulkRows.length })}
        description={t('rations.bulk.confirmBody')}
        footer={
          <>
            <Button variant="ghost" onClick={() => setConfirmBulk(false)}>
              {t('rations.cancel')}
            </Button>
            <Button
              variant="primary"
              loading={acceptDay.isPending}
              onClick={() =>
                acceptDay.mutate(
                  { day: sheet.day, unitIds: chosen.length > 0 ? chosen.map((r) => r.unit.id) : undefined },
                  {
                    onSettled: () => {
                      setConfirmBulk(false);
                      setSelected(new Set());
                    },
                  },
                )
              }
            >
              {t('rations.bulk.confirm', { count: bulkRows.length })}
            </Button>
          </>
        }
      >
        <ul className="flex flex-col gap-1 text-base" data-testid="bulk-list">
          {bulkRows.map((r) => (
            <li key={r.unit.id} className="flex justify-between gap-3 border-b border-line py-1 last:border-b-0">
              <span>
                <span className="font-bold">{r.unit.code}</span> {r.unit.name}
              </span>
              <span className="tabular-nums">{fmtKg(r.recommendation?.recommendedKg ?? 0, locale)} kg</span>
            </li>
          ))}
        </ul>
      </Dialog>
    </div>
  );
}
