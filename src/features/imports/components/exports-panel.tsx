import { addDays, localDay, zonedTime } from '@shared/farm-time';
import { EXPORT_MAX_RANGE_DAYS } from '@shared/schemas/exports.schema';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { buttonClasses } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { Select, TextField } from '@/components/ui/field';
import { Icon } from '@/components/ui/icon';
import { exportHref, importQueries } from '../api/imports-api';

const kinds = ['tests', 'results', 'readings'] as const;

/** CSV downloads per unit (or the whole farm) and a range of farm-local days. */
export function ExportsPanel({ farmId, timeZone }: { farmId: string; timeZone: string }) {
  const { t } = useTranslation();
  const units = useQuery(importQueries.units(farmId));
  const today = localDay(new Date(), timeZone);
  const [unitId, setUnitId] = useState('');
  const [from, setFrom] = useState(addDays(today, -6));
  const [to, setTo] = useState(today);
  const valid = /^\d{4}-\d{2}-\d{2}$/.test(from) && /^\d{4}-\d{2}-\d{2}$/.test(to);
  const fromAt = valid ? zonedTime(from, 0, 0, timeZone) : null;
  const toAt = valid ? zonedTime(addDays(to, 1), 0, 0, timeZone) : null;
  const problem = !valid
    ? t('imports.exports.pickDays')
    : fromAt! >= toAt!
      ? t('imports.exports.order')
      : toAt!.getTime() - fromAt!.getTime() > EXPORT_MAX_RANGE_DAYS * 86_400_000
        ? t('imports.exports.tooLong', { days: EXPORT_MAX_RANGE_DAYS })
        : null;

  return (
    <section className="gw-card flex flex-col gap-4 p-4 sm:p-5" aria-labelledby="exports-title" data-testid="exports">
      <h2 id="exports-title" className="text-xl font-bold">
        {t('imports.exports.title')}
      </h2>
      <p className="text-base text-muted">{t('imports.exports.intro', { tz: timeZone })}</p>
      <div className="grid gap-4 sm:grid-cols-3">
        <Select
          label={t('imports.exports.unit')}
          value={unitId}
          onChange={(e) => setUnitId(e.target.value)}
          options={[
            { value: '', label: t('imports.exports.allUnits') },
            ...(units.data ?? []).map((u) => ({ value: u.id, label: `${u.code} — ${u.name}` })),
          ]}
        />
        <TextField label={t('imports.exports.from')} type="date" value={from} max={to} onChange={(e) => setFrom(e.target.value)} />
        <TextField label={t('imports.exports.to')} type="date" value={to} min={from} onChange={(e) => setTo(e.target.value)} />
      </div>
      {problem ? (
        <Callout tone="danger" live>
          {problem}
        </Callout>
      ) : (
        <ul className="grid gap-3 md:grid-cols-3">
          {kinds.map((k) => (
            <li key={k} className="flex flex-col gap-2 rounded-xl border-2 border-line bg-paper p-3">
              <a
                href={exportHref(farmId, k, { unitId: unitId || undefined, from: fromAt!.toISOString(), to: toAt!.toISOString() })}
                download
                className={buttonClasses({ variant: 'secondary', fullWidth: true })}
                data-testid={`export-${k}`}
              >
                <Icon name="upload" className="rotate-180" />
                {t(`imports.exports.kind.${k}`)}
              </a>
              <p className="text-sm text-muted">{t(`imports.exports.about.${k}`)}</p>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
