import { outboxKinds, outboxStatuses, type OutboxMessageDto } from '@shared/schemas/outbox.schema';
import { useInfiniteQuery, useQuery } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { EmptyState } from '@/components/ui/empty-state';
import { Select } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { outboxQueries, type OutboxFilters, type OutboxScope } from '../api/outbox-queries';

const deliveryLook = {
  received: { glyph: '●', className: 'border-clear bg-clear-soft text-clear-ink' },
  not_found: { glyph: '▲', className: 'border-watch bg-watch-soft text-watch-ink' },
  not_sent: { glyph: '◆', className: 'border-act bg-act-soft text-act-ink' },
  unknown: { glyph: '○', className: 'border-dashed border-silent bg-silent-soft text-silent-ink' },
} as const;

function Detail({ farmId, scope, id, timeZone }: { farmId: string; scope: OutboxScope; id: string; timeZone: string }) {
  const { t, i18n } = useTranslation();
  const q = useQuery(outboxQueries.detail(farmId, scope, id));
  if (q.isPending) return <Spinner label={t('outbox.loading')} />;
  if (q.isError)
    return (
      <Callout tone="danger" title={t('outbox.detailFailed')}>
        {requestErrorText(t, q.error)}
      </Callout>
    );
  const d = q.data;
  return (
    <div className="grid gap-3 lg:grid-cols-2" data-testid="outbox-detail">
      <div className="flex min-w-0 flex-col gap-1">
        <h4 className="text-base font-bold">{t('outbox.sentText')}</h4>
        <pre
          className="max-h-80 overflow-auto whitespace-pre-wrap break-words rounded-xl border-2 border-line bg-paper p-3 font-mono text-sm"
          data-testid="outbox-body"
        >
          {d.body}
        </pre>
      </div>
      <div className="flex min-w-0 flex-col gap-1">
        <h4 className="text-base font-bold">{t('outbox.receivedText')}</h4>
        {d.receivedText !== null ? (
          <>
            <pre
              className="max-h-80 overflow-auto whitespace-pre-wrap break-words rounded-xl border-2 border-line bg-card p-3 font-mono text-sm"
              data-testid="outbox-received"
            >
              {d.receivedText}
            </pre>
            {d.received ? (
              <p className="text-sm text-muted">
                {t('outbox.receivedAt', {
                  time: new Intl.DateTimeFormat(i18n.language, {
                    timeZone,
                    dateStyle: 'medium',
                    timeStyle: 'medium',
                    hourCycle: 'h23',
                  }).format(new Date(d.received.receivedAt)),
                  from: d.received.from,
                })}
              </p>
            ) : null}
          </>
        ) : (
          <p className="text-base text-muted">{t(`outbox.noCopy.${d.delivery}`)}</p>
        )}
        {d.error ? <p className="text-base font-bold text-act">{d.error}</p> : null}
      </div>
    </div>
  );
}

function Message({ farmId, scope, m, timeZone }: { farmId: string; scope: OutboxScope; m: OutboxMessageDto; timeZone: string }) {
  const { t, i18n } = useTranslation();
  const [open, setOpen] = useState(false);
  const look = deliveryLook[m.delivery];
  return (
    <li className="gw-card flex min-w-0 flex-col gap-3 p-4" data-testid="outbox-message" data-kind={m.kind} data-to={m.to}>
      <button type="button" className="flex flex-col gap-2 text-left" onClick={() => setOpen((v) => !v)} aria-expanded={open}>
        <span className="flex flex-wrap items-center gap-2">
          <span className="rounded-full bg-abyss-700 px-2.5 py-0.5 text-sm font-bold text-white">{t(`outbox.kind.${m.kind}`)}</span>
          <span className={cx('inline-flex items-center gap-1 rounded-full border-2 px-2.5 py-0.5 text-sm font-bold', look.className)}>
            <span aria-hidden="true">{look.glyph}</span>
            {t(`outbox.delivery.${m.delivery}`)}
          </span>
          <span className="ml-auto text-sm tabular-nums text-muted">
            {new Intl.DateTimeFormat(i18n.language, { timeZone, dateStyle: 'medium', timeStyle: 'short', hourCycle: 'h23' }).format(
              new Date(m.sentAt ?? m.createdAt),
            )}
          </span>
        </span>
        <span className="text-lg font-bold leading-snug" data-testid="outbox-subject">
          {m.subject}
        </span>
        <span className="break-all text-base text-muted">{t('outbox.to', { to: m.to })}</span>
        <span className="gw-link self-start text-base">{open ? t('outbox.hide') : t('outbox.show')}</span>
      </button>
      {open ? <Detail farmId={farmId} scope={scope} id={m.id} timeZone={timeZone} /> : null}
    </li>
  );
}

/** The e-mails Gillwise sent, as the local mail catcher received them. */
export function OutboxScreen({ farmId, timeZone, isAdmin }: { farmId: string; timeZone: string; isAdmin: boolean }) {
  const { t } = useTranslation();
  const [scope, setScope] = useState<OutboxScope>('farm');
  const [kind, setKind] = useState('');
  const [status, setStatus] = useState('');
  const filters: OutboxFilters = {
    scope,
    kind: (kind || undefined) as OutboxFilters['kind'],
    status: (status || undefined) as OutboxFilters['status'],
  };
  const q = useInfiniteQuery(outboxQueries.list(farmId, filters));
  const messages = useMemo(() => q.data?.pages.flatMap((p) => p.messages) ?? [], [q.data]);
  const reachable = q.data?.pages.every((p) => p.catcherReachable) ?? true;

  return (
    <div className="flex flex-col gap-5" data-testid="outbox">
      {isAdmin ? (
        <div
          role="tablist"
          aria-label={t('outbox.scopeLabel')}
          className="inline-flex w-full flex-wrap rounded-xl border-2 border-abyss-700 bg-card p-1 sm:w-auto"
        >
          {(['farm', 'farmless'] as const).map((s) => (
            <button
              key={s}
              type="button"
              role="tab"
              aria-selected={scope === s}
              onClick={() => setScope(s)}
              className={cx(
                'min-h-11 flex-1 rounded-lg px-4 text-base font-bold sm:flex-none',
                scope === s ? 'bg-abyss-700 text-white' : 'text-abyss-800 hover:bg-abyss-50',
              )}
            >
              {t(`outbox.scope.${s}`)}
            </button>
          ))}
        </div>
      ) : null}
      <div className="grid grid-cols-2 gap-3 sm:gap-4 lg:max-w-2xl">
        <Select
          label={t('outbox.filter.kind')}
          value={kind}
          onChange={(e) => setKind(e.target.value)}
          options={[{ value: '', label: t('outbox.filter.all') }, ...outboxKinds.map((k) => ({ value: k, label: t(`outbox.kind.${k}`) }))]}
        />
        <Select
          label={t('outbox.filter.status')}
          value={status}
          onChange={(e) => setStatus(e.target.value)}
          options={[
            { value: '', label: t('outbox.filter.all') },
            ...outboxStatuses.map((k) => ({ value: k, label: t(`outbox.status.${k}`) })),
          ]}
        />
      </div>
      {!reachable ? (
        <Callout tone="caution" title={t('outbox.catcherDown')}>
          {t('outbox.catcherDownBody')}
        </Callout>
      ) : null}
      {q.isPending ? (
        <Spinner label={t('outbox.loading')} />
      ) : q.isError ? (
        <Callout tone="danger" title={t('outbox.loadFailed')}>
          {requestErrorText(t, q.error)}
        </Callout>
      ) : messages.length === 0 ? (
        <EmptyState icon="mail" title={t('outbox.empty.title')}>
          {t('outbox.empty.body')}
        </EmptyState>
      ) : (
        <>
          <ul className="flex flex-col gap-3" data-testid="outbox-list">
            {messages.map((m) => (
              <Message key={m.id} farmId={farmId} scope={scope} m={m} timeZone={timeZone} />
            ))}
          </ul>
          {q.hasNextPage ? (
            <Button variant="secondary" className="self-center" loading={q.isFetchingNextPage} onClick={() => void q.fetchNextPage()}>
              {t('outbox.older')}
            </Button>
          ) : null}
        </>
      )}
    </div>
  );
}
