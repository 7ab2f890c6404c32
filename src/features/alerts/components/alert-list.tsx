import type { AlertDto } from '@shared/schemas/alerts.schema';
import { useInfiniteQuery } from '@tanstack/react-query';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { alertQueries } from '../api/alert-queries';
import type { AlertListFilters } from '../api/keys';
import { useAlertPermissions } from '../hooks/use-alert-permissions';
import { AlertCard, type AlertCardProps } from './alert-card';

export interface AlertListProps {
  farmId: string;
  timeZone: string;
  filters: AlertListFilters;
  compact?: boolean;
  /** What to say when nothing matches. */
  emptyTitle: string;
  emptyBody?: string;
  onDone?: AlertCardProps['onDone'];
}

export function AlertList({ farmId, timeZone, filters, compact, emptyTitle, emptyBody, onDone }: AlertListProps) {
  const { t } = useTranslation();
  const { can, me } = useAlertPermissions();
  const query = useInfiniteQuery(alertQueries.list(farmId, filters));

  if (query.isPending) return <Spinner label={t('alerts.loading')} />;
  if (query.isError) {
    return (
      <Callout tone="danger" title={t('alerts.loadFailed')}>
        <Button variant="secondary" onClick={() => void query.refetch()} className="mt-2">
          {t('common.retry')}
        </Button>
      </Callout>
    );
  }
  // Act before watch, open before acknowledged, newest first (the resolved list stays newest first).
  const rank = (a: AlertDto) => (filters.state === 'resolved' ? 0 : (a.level === 'act' ? 0 : 2) + (a.state === 'open' ? 0 : 1));
  const alerts = query.data.pages
    .flatMap((p) => p.alerts)
    .map((a, i) => ({ a, i }))
    .sort((x, y) => rank(x.a) - rank(y.a) || x.i - y.i)
    .map(({ a }) => a);
  if (alerts.length === 0) {
    return compact ? (
      <p className="text-base text-muted" data-testid="alerts-empty">
        {emptyTitle}
      </p>
    ) : (
      <EmptyState icon="check" title={emptyTitle}>
        {emptyBody}
      </EmptyState>
    );
  }
  return (
    <div className="flex flex-col gap-3">
      {compact ? null : (
        <p className="text-base text-muted" data-testid="alert-count">
          {query.hasNextPage ? t('alerts.countMore', { count: alerts.length }) : t('alerts.count', { count: alerts.length })}
        </p>
      )}
      <ul className="flex flex-col gap-3" data-testid="alert-list">
        {alerts.map((a) => (
          <li key={a.id}>
            <AlertCard farmId={farmId} alert={a} timeZone={timeZone} can={can} me={me} compact={compact} onDone={onDone} />
          </li>
        ))}
      </ul>
      {query.hasNextPage ? (
        <Button variant="secondary" onClick={() => void query.fetchNextPage()} loading={query.isFetchingNextPage} className="self-start">
          {t('alerts.more')}
        </Button>
      ) : null}
    </div>
  );
}

/** The open and acknowledged alerts of one unit (the map's sheet, the unit page). */
export function UnitAlerts({ farmId, unitId, timeZone }: { farmId: string; unitId: string; timeZone: string }) {
  const { t } = useTranslation();
  return (
    <AlertList farmId={farmId} timeZone={timeZone} filters={{ state: 'active', unitId }} compact emptyTitle={t('alerts.noneForUnit')} />
  );
}
