import { putOnCallRequestSchema, type OnCallEntryDto } from '@shared/schemas/alerts.schema';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Select, TextField } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { usePutOnCall } from '../../api/setup-mutations';
import { setupQueries } from '../../api/setup-queries';

interface Row {
  key: string;
  userId: string;
  name: string;
  role: string;
  startsLocal: string;
  endsLocal: string;
  weekdays: number[];
}

const ALL_DAYS = [1, 2, 3, 4, 5, 6, 7];
const toRow = (e: OnCallEntryDto): Row => ({
  key: e.id,
  userId: e.userId,
  name: e.name,
  role: e.role,
  startsLocal: e.startsLocal,
  endsLocal: e.endsLocal,
  weekdays: e.weekdays,
});

function weekdayName(d: number, locale: string, style: 'short' | 'long' = 'short') {
  // 2024-01-01 was a Monday (ISO weekday 1).
  return new Intl.DateTimeFormat(locale, { weekday: style, timeZone: 'UTC' }).format(new Date(Date.UTC(2024, 0, d)));
}

/** Who is e-mailed when an act-level alert waits, in order, and the farm-local hours each covers. */
export function OnCallPanel({ farmId }: { farmId: string }) {
  const { t, i18n } = useTranslation();
  const l = i18n.language;
  const q = useQuery(setupQueries.onCall(farmId));
  const people = useQuery(setupQueries.people(farmId));
  const put = usePutOnCall(farmId);
  const [rows, setRows] = useState<Row[] | null>(null);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(false);

  if (q.isPending) return <Spinner label={t('setup.loading')} />;
  if (q.isError)
    return (
      <Callout tone="danger" title={t('setup.loadFailed')}>
        {requestErrorText(t, q.error)}
      </Callout>
    );
  const data = q.data;
  const setRow = (i: number, patch: Partial<Row>) => setRows((rs) => (rs ? rs.map((r, j) => (j === i ? { ...r, ...patch } : r)) : rs));
  const move = (i: number, d: -1 | 1) =>
    setRows((rs) => {
      if (!rs) return rs;
      const next = [...rs];
      const [r] = next.splice(i, 1);
      next.splice(i + d, 0, r!);
      return next;
    });
  const active = (people.data ?? []).filter((p) => p.active);

  const save = async () => {
    if (!rows) return;
    const parsed = putOnCallRequestSchema.safeParse({
      entries: rows.map(({ userId, startsLocal, endsLocal, weekdays }) => ({ userId, startsLocal, endsLocal, weekdays })),
    });
    if (!parsed.success) {
      const next: Record<string, string> = {};
      for (const issue of parsed.error.issues) {
        const [, i, f] = issue.path;
        next[`${String(i)}.${String(f ?? 'endsLocal')}`] ??=
          f === 'weekdays'
            ? t('setup.oncall.pickDay')
            : issue.message.includes('differ')
              ? t('setup.oncall.differ')
              : t('setup.oncall.timeFormat');
      }
      return setErrors(next);
    }
    setErrors({});
    try {
      await put.mutateAsync(parsed.data);
      setRows(null);
      setSaved(true);
    } catch {
      /* shown below */
    }
  };

  return (
    <div className="flex flex-col gap-4" data-testid="on-call-panel">
      <p className="max-w-prose text-base text-muted">{t('setup.oncall.intro', { minutes: data.escalationMinutes, tz: data.timeZone })}</p>
      {data.firstNow ? (
        <Callout tone="info" title={t('setup.oncall.firstNow', { name: data.firstNow.name })} />
      ) : (
        <Callout tone="caution" title={t('setup.oncall.nobodyNow')}>
          {t('setup.oncall.afterList')}
        </Callout>
      )}
      {saved ? <Callout tone="success" live title={t('setup.oncall.saved')} /> : null}
      {!rows ? (
        <>
          <ol className="flex flex-col gap-2">
            {data.entries.map((e) => (
              <li key={e.id} className={cx('gw-card flex flex-wrap items-center gap-3 px-4 py-3', e.coversNow && 'border-abyss-600')}>
                <span className="grid size-9 place-items-center rounded-full bg-abyss-700 font-bold text-white">{e.position}</span>
                <span className="min-w-0 flex-1">
                  <span className="block font-bold">{e.name}</span>
                  <span className="block text-sm text-muted">
                    {t(`roles.${e.role}`)} · {e.email}
                  </span>
                </span>
                <span className="text-base tabular-nums">
                  {e.startsLocal}–{e.endsLocal}
                  <span className="block text-sm text-muted">
                    {e.weekdays.length === 7 ? t('setup.oncall.everyDay') : e.weekdays.map((d) => weekdayName(d, l)).join(' ')}
                  </span>
                </span>
                {e.coversNow ? (
                  <span className="rounded-full bg-clear-soft px-2 py-0.5 text-sm font-bold text-clear-ink">
                    {t('setup.oncall.coversNow')}
                  </span>
                ) : null}
              </li>
            ))}
          </ol>
          {data.entries.length === 0 ? <p className="text-base text-muted">{t('setup.oncall.empty')}</p> : null}
          <p className="text-sm text-muted">{t('setup.oncall.afterList')}</p>
          <Button
            variant="secondary"
            className="self-start"
            onClick={() => {
              setRows(data.entries.map(toRow));
              setSaved(false);
            }}
          >
            {t('setup.oncall.edit')}
          </Button>
        </>
      ) : (
        <div className="flex flex-col gap-3" data-testid="on-call-editor">
          {rows.map((r, i) => (
            <fieldset key={r.key} className="flex flex-col gap-3 rounded-xl border-2 border-line bg-card p-3">
              <legend className="px-1 text-base font-bold">
                {i + 1}. {r.name} <span className="font-normal text-muted">({t(`roles.${r.role}`)})</span>
              </legend>
              <div className="grid grid-cols-2 gap-3 sm:grid-cols-[9rem_9rem_minmax(0,1fr)]">
                <TextField
                  label={t('setup.oncall.from')}
                  value={r.startsLocal}
                  inputMode="numeric"
                  placeholder="00:00"
                  onChange={(e) => setRow(i, { startsLocal: e.target.value })}
                  error={errors[`${i}.startsLocal`]}
                />
                <TextField
                  label={t('setup.oncall.to')}
                  value={r.endsLocal}
                  inputMode="numeric"
                  placeholder="24:00"
                  onChange={(e) => setRow(i, { endsLocal: e.target.value })}
                  error={errors[`${i}.endsLocal`]}
                />
                <fieldset className="col-span-2 sm:col-span-1">
                  <legend className="mb-1.5 text-base font-bold">{t('setup.oncall.days')}</legend>
                  <div className="flex flex-wrap gap-1.5">
                    {ALL_DAYS.map((d) => (
                      <label
                        key={d}
                        className={cx(
                          'flex min-h-10 items-center gap-1.5 rounded-lg border-2 px-2 text-sm font-bold',
                          r.weekdays.includes(d) ? 'border-abyss-700 bg-abyss-50' : 'border-line',
                        )}
                      >
                        <input
                          type="checkbox"
                          className="size-4 accent-abyss-700"
                          checked={r.weekdays.includes(d)}
                          onChange={(e) =>
                            setRow(i, { weekdays: e.target.checked ? [...r.weekdays, d].sort() : r.weekdays.filter((x) => x !== d) })
                          }
                          aria-label={weekdayName(d, l, 'long')}
                        />
                        <span aria-hidden="true">{weekdayName(d, l)}</span>
                      </label>
                    ))}
                  </div>
                  {errors[`${i}.weekdays`] ? <p className="mt-1 font-bold text-act">{errors[`${i}.weekdays`]}</p> : null}
                </fieldset>
              </div>
              <div className="flex flex-wrap gap-2">
                <Button variant="ghost" disabled={i === 0} onClick={() => move(i, -1)}>
                  {t('setup.oncall.up')}
                </Button>
                <Button variant="ghost" disabled={i === rows.length - 1} onClick={() => move(i, 1)}>
                  {t('setup.oncall.down')}
                </Button>
                <Button variant="ghost" onClick={() => setRows((rs) => (rs ? rs.filter((_, j) => j !== i) : rs))}>
                  {t('setup.oncall.remove')}
                </Button>
              </div>
            </fieldset>
          ))}
          <Select
            label={t('setup.oncall.add')}
            hint={people.isError ? t('setup.oncall.noPeople') : undefined}
            options={[
              { value: '', label: t('setup.oncall.pickPerson') },
              ...active.map((p) => ({ value: p.userId, label: `${p.name} (${t(`roles.${p.role}`)})` })),
            ]}
            value=""
            onChange={(e) => {
              const p = active.find((x) => x.userId === e.target.value);
              if (p)
                setRows((rs) => [
                  ...(rs ?? []),
                  {
                    key: `new-${p.userId}-${Date.now()}`,
                    userId: p.userId,
                    name: p.name,
                    role: p.role,
                    startsLocal: '00:00',
                    endsLocal: '24:00',
                    weekdays: ALL_DAYS,
                  },
                ]);
            }}
          />
          {put.error ? (
            <Callout tone="danger" live title={t('setup.oncall.saveFailed')}>
              {requestErrorText(t, put.error)}
            </Callout>
          ) : null}
          <div className="flex flex-wrap justify-end gap-2">
            <Button
              variant="ghost"
              onClick={() => {
                setRows(null);
                setErrors({});
              }}
            >
              {t('setup.cancel')}
            </Button>
            <Button variant="primary" loading={put.isPending} onClick={() => void save()}>
              {t('setup.oncall.save')}
            </Button>
          </div>
        </div>
      )}
    </div>
  );
}
