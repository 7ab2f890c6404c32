import { addDays, zonedTime } from '@shared/farm-time';
import type { AuditEventDto } from '@shared/schemas/audit.schema';
import { useInfiniteQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { EmptyState } from '@/components/ui/empty-state';
import { Select, TextField } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { auditQueries, type AuditFilters } from '../api/audit-queries';
import { diffRows, show } from '../lib/diff';

export const auditEntities = [
  'unit',
  'probe',
  'threshold_profile',
  'feeding_table',
  'feed_recommendation',
  'feeding_record',
  'stock_event',
  'treatment',
  'water_test',
  'membership',
  'on_call_list',
  'import',
  'farm',
] as const;

function Entry({ e, timeZone }: { e: AuditEventDto; timeZone: string }) {
  const { t, i18n } = useTranslation();
  const [open, setOpen] = useState(false);
  const rows = diffRows(e.before, e.after);
  const changed = rows.filter((r) => r.changed);
  const shown = open ? rows : changed.length ? changed : rows.slice(0, 4);
  const created = e.before === null && e.after !== null;
  const removed = e.after === null && e.before !== null;
  const human = e.action.replace(/[._]/g, ' ');
  return (
    <li className="gw-card flex flex-col gap-2 p-4" data-testid="audit-entry" data-action={e.action}>
      <div className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1">
        <p className="text-lg">
          <span className="font-bold">{e.actor?.name ?? t('audit.system')}</span>{' '}
          <span>{t(`audit.action.${e.action}`, { defaultValue: human })}</span>
        </p>
        <time dateTime={e.at} className="text-base tabular-nums text-muted">
          {new Intl.DateTimeFormat(i18n.language, { timeZone, dateStyle: 'medium', timeStyle: 'medium', hourCycle: 'h23' }).format(
            new Date(e.at),
          )}
        </time>
      </div>
      <p className="text-sm text-muted">
        {t(`audit.entity.${e.entity}`, { defaultValue: e.entity })}
        {e.entityId ? <span className="ml-1 font-mono">{e.entityId.slice(0, 8)}</span> : null}
        {e.actor ? ` · ${e.actor.email}` : ''}
      </p>
      {rows.length > 0 ? (
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-sm">
            <thead className="text-left">
              <tr>
                <th scope="col" className="border-b-2 border-line px-2 py-1.5">
                  {t('audit.field')}
                </th>
                {!created ? (
                  <th scope="col" className="border-b-2 border-line px-2 py-1.5">
                    {t('audit.before')}
                  </th>
                ) : null}
                {!removed ? (
                  <th scope="col" className="border-b-2 border-line px-2 py-1.5">
                    {t('audit.after')}
                  </th>
                ) : null}
              </tr>
            </thead>
            <tbody>
              {shown.map((r) => (
                <tr key={r.key} className={cx('border-b border-line align-top last:border-b-0', r.changed && 'bg-ember-50')}>
                  <th scope="row" className="whitespace-nowrap px-2 py-1.5 text-left font-bold">
                    {r.changed ? (
                      <span aria-hidden="true" className="mr-1 text-ember-700">
                        ●
                      </span>
                    ) : null}
                    {r.key}
                  </th>
                  {!created ? <td className="break-all px-2 py-1.5 font-mono">{show(r.before)}</td> : null}
                  {!removed ? <td className={cx('break-all px-2 py-1.5 font-mono', r.changed && 'font-bold')}>{show(r.after)}</td> : null}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {rows.length > shown.length || open ? (
        <Button variant="ghost" className="self-start" onClick={() => setOpen((v) => !v)} aria-expanded={open}>
          {open ? t('audit.fewer') : t('audit.allFields', { count: rows.length })}
        </Button>
      ) : null}
    </li>
  );
}

/** Who changed what and when, with the values before and after; filter by kind, person and days. */
export function AuditScreen({ farmId, timeZone }: { farmId: string; timeZone: string }) {
  const { t } = useTranslation();
  const [entity, setEntity] = useState('');
  const [actorId, setActorId] = useState('');
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const [people, setPeople] = useState<Map<string, string>>(new Map());
  const day = (d: string) => /^\d{4}-\d{2}-\d{2}$/.test(d);
  const badRange = day(from) && day(to) && from > to;
  const filters: AuditFilters = {
    entity: entity || undefined,
    actorId: actorId || undefined,
    from: day(from) ? zonedTime(from, 0, 0, timeZone).toISOString() : undefined,
    to: day(to) ? zonedTime(addDays(to, 1), 0, 0, timeZone).toISOString() : undefined,
  };
  const q = useInfiniteQuery({ ...auditQueries.list(farmId, filters), enabled: !badRange });
  const items = useMemo(() => q.data?.pages.flatMap((p) => p.items) ?? [], [q.data]);
  // Everyone seen so far can be picked as the person (there is no separate list of actors).
  useEffect(() => {
    setPeople((prev) => {
      const next = new Map(prev);
      for (const e of items) if (e.actor && !next.has(e.actor.id)) next.set(e.actor.id, e.actor.name);
      return next.size === prev.size ? prev : next;
    });
  }, [items]);
  const known = people;

  return (
    <div className="flex flex-col gap-5" data-testid="audit">
      <div className="grid gap-4 sm:grid-cols-2 xl:grid-cols-4">
        <Select
          label={t('audit.filter.entity')}
          value={entity}
          onChange={(e) => setEntity(e.target.value)}
          options={[
            { value: '', label: t('audit.filter.everything') },
            ...auditEntities.map((x) => ({ value: x, label: t(`audit.entity.${x}`) })),
          ]}
        />
        <Select
          label={t('audit.filter.person')}
          value={actorId}
          onChange={(e) => setActorId(e.target.value)}
          options={[{ value: '', label: t('audit.filter.anyone') }, ...[...known].map(([id, name]) => ({ value: id, label: name }))]}
        />
        <TextField label={t('audit.filter.from')} type="date" value={from} onChange={(e) => setFrom(e.target.value)} />
        <TextField
          label={t('audit.filter.to')}
          type="date"
          value={to}
          onChange={(e) => setTo(e.target.value)}
          error={badRange ? t('audit.filter.order') : undefined}
        />
      </div>
      {q.isPending && !badRange ? (
        <Spinner label={t('audit.loading')} />
      ) : q.isError ? (
        <Callout tone="danger" title={t('audit.loadFailed')}>
          {requestErrorText(t, q.error)}
        </Callout>
      ) : items.length === 0 ? (
        <EmptyState icon="shield" title={t('audit.empty.title')}>
          {t('audit.empty.body')}
        </EmptyState>
      ) : (
        <>
          <ol className="flex flex-col gap-3" data-testid="audit-list">
            {items.map((e) => (
              <Entry key={e.id} e={e} timeZone={timeZone} />
            ))}
          </ol>
          {q.hasNextPage ? (
            <Button variant="secondary" className="self-center" loading={q.isFetchingNextPage} onClick={() => void q.fetchNextPage()}>
              {t('audit.older')}
            </Button>
          ) : (
            <p className="text-center text-base text-muted">{t('audit.end')}</p>
          )}
        </>
      )}
    </div>
  );
}
