import type { AlertDto } from '@shared/schemas/alerts.schema';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Icon } from '@/components/ui/icon';
import { StatusBadge } from '@/components/ui/status-badge';
import { useAcknowledgeAlert } from '../api/alert-mutations';
import { useActionError } from '../hooks/use-action-error';
import { formatFarmTime, measuredLine } from '../lib/format';
import { AssignDialog, ResolveDialog } from './alert-action-dialogs';

export interface AlertPermissions {
  acknowledge: boolean;
  assign: boolean;
  resolve: boolean;
}

export interface AlertCardProps {
  farmId: string;
  alert: AlertDto;
  timeZone: string;
  can: AlertPermissions;
  me: { id: string; name: string } | null;
  /** Shorter card (the map's sheet and the unit page): no source line. */
  compact?: boolean;
  /** Told after an action went through (the list may move the alert to another tab). */
  onDone?: (action: 'acknowledged' | 'assigned' | 'resolved', title: string) => void;
}

export function alertTitle(alert: AlertDto, t: (k: string, o?: Record<string, unknown>) => string): string {
  const kind = t(`alerts.kind.${alert.kind}`, { defaultValue: alert.title });
  const where = alert.unitCode ? `${alert.unitCode}${alert.unitName ? ` · ${alert.unitName}` : ''}` : alert.probeLabel;
  // A farm-wide alert (the whole farm silent) names no unit.
  return where ? `${kind} — ${where}` : kind;
}

/** One alert: level, what was measured against which limit, who has it, and the actions the caller may take. */
export function AlertCard({ farmId, alert, timeZone, can, me, compact = false, onDone }: AlertCardProps) {
  const { t, i18n } = useTranslation();
  const locale = i18n.language;
  const title = alertTitle(alert, t);
  const ack = useAcknowledgeAlert(farmId, () => onDone?.('acknowledged', title));
  const ackError = useActionError(ack.error);
  const [dialog, setDialog] = useState<{ kind: 'assign' | 'resolve' | null; n: number }>({ kind: null, n: 0 });
  const open = (kind: 'assign' | 'resolve') => setDialog((d) => ({ kind, n: d.n + 1 }));
  const close = () => setDialog((d) => ({ ...d, kind: null }));
  const measured = measuredLine(alert, t, locale);
  const time = (iso: string) => formatFarmTime(iso, timeZone, locale);
  const resolved = alert.state === 'resolved';
  const headingId = `alert-${alert.id}-title`;

  return (
    <article
      aria-labelledby={headingId}
      data-alert-id={alert.id}
      data-alert-kind={alert.kind}
      data-alert-state={alert.state}
      className={cx(
        'rounded-2xl border-2 bg-card px-4 py-3',
        resolved ? 'border-line' : alert.level === 'act' ? 'border-act border-l-8' : 'border-watch border-l-8',
      )}
    >
      <div className="flex items-center gap-2">
        <StatusBadge status={alert.level} size="sm" className="shrink-0" />
        <span className="flex-1" />
        <span
          className={cx(
            'inline-flex shrink-0 items-center gap-1 rounded-full border-2 px-2.5 py-0.5 text-sm font-bold',
            alert.state === 'open' && 'border-act-ink bg-act-soft text-act-ink',
            alert.state === 'acknowledged' && 'border-abyss-600 bg-abyss-50 text-abyss-900',
            resolved && 'border-clear bg-clear-soft text-clear-ink',
          )}
          data-testid="alert-state"
        >
          <span aria-hidden="true">{alert.state === 'open' ? '!' : alert.state === 'acknowledged' ? '✓' : '✓✓'}</span>
          {t(`alerts.state.${alert.state}`)}
        </span>
      </div>
      <h3 id={headingId} className="mt-1.5 text-lg font-bold leading-snug">
        {compact ? t(`alerts.kind.${alert.kind}`, { defaultValue: alert.title }) : title}
      </h3>
      <p className="text-sm text-muted">
        {t('alerts.opened', { time: time(alert.openedAt) })}
        {alert.lastSeenAt !== alert.openedAt && !resolved ? ` · ${t('alerts.lastSeen', { time: time(alert.lastSeenAt) })}` : ''}
      </p>

      <div className="mt-2 flex flex-col gap-1 text-base">
        {measured ? <p className="font-bold">{measured}</p> : null}
        <p lang="en" className="text-ink">
          {alert.message}
        </p>
        {!compact && alert.rule.source ? (
          <p className="text-sm text-muted">
            {t('alerts.source', { source: alert.rule.source })}
            {alert.rule.profileName ? ` · ${t('alerts.profile', { name: alert.rule.profileName })}` : ''}
          </p>
        ) : null}
        <ul className="mt-1 flex flex-col gap-0.5 text-sm">
          {alert.acknowledgedAt ? (
            <li>{t('alerts.ackBy', { name: alert.acknowledgedBy?.name ?? t('alerts.someone'), time: time(alert.acknowledgedAt) })}</li>
          ) : null}
          {alert.assignedTo ? <li>{t('alerts.assignedTo', { name: alert.assignedTo.name })}</li> : null}
          {alert.resolvedAt ? (
            <li>
              {alert.resolvedBy
                ? t('alerts.resolvedBy', { name: alert.resolvedBy.name, time: time(alert.resolvedAt) })
                : t('alerts.resolvedAuto', { time: time(alert.resolvedAt) })}
              {alert.resolutionNote ? <q className="ml-1 italic">{alert.resolutionNote}</q> : null}
            </li>
          ) : null}
          {!resolved && alert.escalationStep > 0 ? <li>{t('alerts.notified', { count: alert.escalationStep })}</li> : null}
        </ul>
      </div>

      {!resolved && (can.acknowledge || can.assign || can.resolve) ? (
        <div className="mt-3 flex flex-wrap gap-2">
          {alert.state === 'open' && can.acknowledge ? (
            <Button
              variant="accent"
              loading={ack.isPending}
              onClick={() => ack.mutate({ alertId: alert.id })}
              icon={<Icon name="check" />}
              aria-describedby={headingId}
            >
              {t('alerts.acknowledge')}
            </Button>
          ) : null}
          {can.assign ? (
            <Button variant="secondary" onClick={() => open('assign')} aria-describedby={headingId}>
              {alert.assignedTo ? t('alerts.reassign') : t('alerts.assign.open')}
            </Button>
          ) : null}
          {can.resolve ? (
            <Button variant="secondary" onClick={() => open('resolve')} aria-describedby={headingId}>
              {t('alerts.resolve.open')}
            </Button>
          ) : null}
        </div>
      ) : null}
      {ackError ? (
        <Callout tone="danger" live className="mt-3">
          {ackError}
        </Callout>
      ) : null}

      {can.assign ? (
        <AssignDialog
          key={`assign-${dialog.n}`}
          farmId={farmId}
          alert={alert}
          open={dialog.kind === 'assign'}
          onClose={close}
          onDone={() => onDone?.('assigned', title)}
          title={title}
          me={me}
        />
      ) : null}
      {can.resolve ? (
        <ResolveDialog
          key={`resolve-${dialog.n}`}
          farmId={farmId}
          alert={alert}
          open={dialog.kind === 'resolve'}
          onClose={close}
          onDone={() => onDone?.('resolved', title)}
          title={title}
        />
      ) : null}
    </article>
  );
}
