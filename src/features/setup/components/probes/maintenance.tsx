import { createMaintenanceWindowRequestSchema, type ProbeDto } from '@shared/schemas/probes.schema';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { TextField } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { useAddWindow, useDeleteWindow } from '../../api/setup-mutations';
import { setupQueries } from '../../api/setup-queries';
import { farmDateTime, farmLocalToIso, isoToFarmLocal } from '../../lib/time';

/** Maintenance windows: while one is on, the probe's silence and odd readings raise no alerts. */
export function Maintenance({ farmId, probe, timeZone, canEdit }: { farmId: string; probe: ProbeDto; timeZone: string; canEdit: boolean }) {
  const { t, i18n } = useTranslation();
  const list = useQuery(setupQueries.windows(farmId, probe.id));
  const add = useAddWindow(farmId, probe.id);
  const remove = useDeleteWindow(farmId, probe.id);
  const [open, setOpen] = useState(false);
  const [startsAt, setStartsAt] = useState(() => isoToFarmLocal(Date.now(), timeZone));
  const [endsAt, setEndsAt] = useState(() => isoToFarmLocal(Date.now() + 2 * 3600_000, timeZone));
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});

  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    const parsed = createMaintenanceWindowRequestSchema.safeParse({
      startsAt: farmLocalToIso(startsAt, timeZone),
      endsAt: farmLocalToIso(endsAt, timeZone),
      reason,
    });
    if (!parsed.success) {
      const next: Record<string, string> = {};
      for (const issue of parsed.error.issues) {
        const k = String(issue.path[0] ?? 'endsAt');
        next[k] ??=
          k === 'reason'
            ? t('setup.maint.reasonRequired')
            : issue.message.includes('31 days')
              ? t('setup.maint.tooLong')
              : k === 'endsAt'
                ? t('setup.maint.endAfterStart')
                : t('setup.maint.timeInvalid');
      }
      return setErrors(next);
    }
    setErrors({});
    try {
      await add.mutateAsync(parsed.data);
      setOpen(false);
      setReason('');
    } catch {
      /* shown below */
    }
  };

  return (
    <section className="flex flex-col gap-3" aria-label={t('setup.maint.title')}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h4 className="text-lg font-bold">{t('setup.maint.title')}</h4>
        {canEdit && !open ? (
          <Button variant="secondary" onClick={() => setOpen(true)}>
            {t('setup.maint.add')}
          </Button>
        ) : null}
      </div>
      {list.isPending ? (
        <Spinner label={t('setup.loading')} />
      ) : list.data && list.data.length > 0 ? (
        <ul className="flex flex-col gap-1">
          {list.data.map((w) => (
            <li key={w.id} className="flex flex-wrap items-center gap-x-3 gap-y-1 border-b border-line py-1.5 text-base last:border-b-0">
              {w.current ? (
                <span className="rounded-full border-2 border-watch bg-watch-soft px-2 text-sm font-bold text-watch-ink">
                  {t('setup.maint.now')}
                </span>
              ) : null}
              <span>
                {farmDateTime(w.startsAt, timeZone, i18n.language)} – {farmDateTime(w.endsAt, timeZone, i18n.language)}
              </span>
              <span className="text-muted">{w.reason}</span>
              {canEdit && Date.parse(w.endsAt) > Date.now() ? (
                <Button
                  variant="ghost"
                  className="ml-auto"
                  loading={remove.isPending && remove.variables?.windowId === w.id}
                  onClick={() => remove.mutate({ windowId: w.id })}
                >
                  {w.current ? t('setup.maint.endNow') : t('setup.maint.cancel')}
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-base text-muted">{t('setup.maint.none')}</p>
      )}
      {open ? (
        <form onSubmit={(e) => void submit(e)} noValidate className="flex flex-col gap-3 rounded-xl border-2 border-line bg-paper p-3">
          <div className="grid gap-3 sm:grid-cols-2">
            <TextField
              label={t('setup.maint.starts')}
              type="datetime-local"
              value={startsAt}
              onChange={(e) => setStartsAt(e.target.value)}
              error={errors.startsAt}
            />
            <TextField
              label={t('setup.maint.ends')}
              type="datetime-local"
              value={endsAt}
              onChange={(e) => setEndsAt(e.target.value)}
              error={errors.endsAt}
            />
          </div>
          <p className="text-sm text-muted">{t('setup.maint.farmTime', { tz: timeZone })}</p>
          <TextField
            label={t('setup.maint.reason')}
            hint={t('setup.maint.reasonHint')}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            error={errors.reason}
          />
          {add.error || remove.error ? (
            <Callout tone="danger" live title={t('setup.maint.saveFailed')}>
              {requestErrorText(t, add.error ?? remove.error)}
            </Callout>
          ) : null}
          <div className="flex flex-wrap justify-end gap-2">
            <Button variant="ghost" onClick={() => setOpen(false)}>
              {t('setup.cancel')}
            </Button>
            <Button type="submit" variant="primary" loading={add.isPending}>
              {t('setup.maint.save')}
            </Button>
          </div>
        </form>
      ) : null}
    </section>
  );
}
