import { patchFeedingTableSchema, type FeedingTableDto, type FeedingTableRowDto } from '@shared/schemas/feed.schema';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { NumberField, TextField } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { useUpdateFeedingTable } from '../../api/setup-mutations';
import { setupQueries } from '../../api/setup-queries';
import { numberOrNull, numberText } from '../../lib/form';

type RowText = Record<
  'minTemperatureC' | 'maxTemperatureC' | 'minWeightG' | 'maxWeightG' | 'pctBodyWeightPerDay' | 'daysPerWeek' | 'note',
  string
> & {
  extra: Pick<FeedingTableRowDto, 'fcr' | 'dailyLengthGainCm'>;
};
const numberKeys = ['minTemperatureC', 'maxTemperatureC', 'minWeightG', 'maxWeightG', 'pctBodyWeightPerDay', 'daysPerWeek'] as const;

const toText = (r: FeedingTableRowDto): RowText => ({
  minTemperatureC: numberText(r.minTemperatureC),
  maxTemperatureC: numberText(r.maxTemperatureC),
  minWeightG: numberText(r.minWeightG),
  maxWeightG: numberText(r.maxWeightG),
  pctBodyWeightPerDay: numberText(r.pctBodyWeightPerDay),
  daysPerWeek: numberText(r.daysPerWeek),
  note: r.note ?? '',
  extra: { fcr: r.fcr, dailyLengthGainCm: r.dailyLengthGainCm },
});

function useRateText() {
  const { t, i18n } = useTranslation();
  const n = (v: number) => new Intl.NumberFormat(i18n.language, { maximumFractionDigits: 2 }).format(v);
  return {
    pct: (v: number) =>
      v === -1
        ? t('setup.feed.hatchery')
        : v === -0.5
          ? t('setup.feed.halfHatchery')
          : v === 0
            ? t('setup.feed.noFeeding')
            : t('setup.feed.pct', { pct: n(v) }),
    days: (v: number) =>
      v === 7
        ? t('setup.feed.daily')
        : v === 3.5
          ? t('setup.feed.everyOther')
          : v === 0
            ? t('setup.feed.never')
            : t('setup.feed.perWeek', { count: v, n: n(v) }),
    n,
  };
}

function TableCard({ farmId, table, canEdit }: { farmId: string; table: FeedingTableDto; canEdit: boolean }) {
  const { t } = useTranslation();
  const rate = useRateText();
  const update = useUpdateFeedingTable(farmId);
  const [rows, setRows] = useState<RowText[] | null>(null);
  const [source, setSource] = useState(table.source);
  const [cap, setCap] = useState(numberText(table.maxKgPerHaPerDay));
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(false);
  const setRow = (i: number, k: keyof RowText, v: string) =>
    setRows((rs) => (rs ? rs.map((r, j) => (j === i ? { ...r, [k]: v } : r)) : rs));

  const save = async () => {
    if (!rows) return;
    const body = {
      source: source.trim(),
      maxKgPerHaPerDay: numberOrNull(cap),
      rows: rows.map((r) => ({
        ...Object.fromEntries(numberKeys.map((k) => [k, numberOrNull(r[k]) ?? Number.NaN])),
        ...(r.note.trim() ? { note: r.note.trim() } : {}),
        ...(r.extra.fcr !== undefined ? { fcr: r.extra.fcr } : {}),
        ...(r.extra.dailyLengthGainCm !== undefined ? { dailyLengthGainCm: r.extra.dailyLengthGainCm } : {}),
      })),
      ...(reason.trim() ? { reason: reason.trim() } : {}),
    };
    const parsed = patchFeedingTableSchema.safeParse(body);
    if (!parsed.success) {
      const next: Record<string, string> = {};
      for (const issue of parsed.error.issues) {
        const [a, i, f] = issue.path;
        const key = a === 'rows' && typeof i === 'number' ? `${i}.${String(f ?? 'minTemperatureC')}` : String(a);
        next[key] ??=
          f === 'maxTemperatureC' || f === 'maxWeightG'
            ? t('setup.feed.bandOrder')
            : f === 'pctBodyWeightPerDay'
              ? t('setup.feed.pctInvalid')
              : a === 'source'
                ? t('setup.feed.sourceRequired')
                : t('setup.feed.invalid');
      }
      return setErrors(next);
    }
    setErrors({});
    try {
      await update.mutateAsync({ tableId: table.id, body: parsed.data });
      setRows(null);
      setReason('');
      setSaved(true);
    } catch {
      /* shown below */
    }
  };

  return (
    <li className="gw-card flex flex-col gap-3 p-4" data-testid="feeding-table">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div className="min-w-0">
          <h3 className="text-lg font-bold">{table.name}</h3>
          <p className="text-base text-muted">
            {table.species.replace(/_/g, ' ')}
            {table.maxKgPerHaPerDay !== null ? ` · ${t('setup.feed.cap', { kg: rate.n(table.maxKgPerHaPerDay) })}` : ''}
          </p>
          <p className="text-sm" data-testid="feeding-source">
            <span className="font-bold">{t('setup.feed.source')}:</span> {table.source}
          </p>
        </div>
        {canEdit && !rows ? (
          <Button
            variant="secondary"
            onClick={() => {
              setRows(table.rows.map(toText));
              setSource(table.source);
              setCap(numberText(table.maxKgPerHaPerDay));
              setSaved(false);
            }}
          >
            {t('setup.feed.edit')}
          </Button>
        ) : null}
      </div>
      {saved ? <Callout tone="success" live title={t('setup.feed.saved')} /> : null}
      {!rows ? (
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-base">
            <thead className="bg-abyss-50 text-left">
              <tr>
                <th scope="col" className="border-b-2 border-line px-3 py-2">
                  {t('setup.feed.water')}
                </th>
                <th scope="col" className="border-b-2 border-line px-3 py-2">
                  {t('setup.feed.weight')}
                </th>
                <th scope="col" className="border-b-2 border-line px-3 py-2">
                  {t('setup.feed.ration')}
                </th>
                <th scope="col" className="border-b-2 border-line px-3 py-2">
                  {t('setup.feed.days')}
                </th>
                <th scope="col" className="border-b-2 border-line px-3 py-2">
                  {t('setup.feed.note')}
                </th>
              </tr>
            </thead>
            <tbody>
              {table.rows.map((r, i) => (
                <tr key={i} className="border-b border-line align-top last:border-b-0 even:bg-paper">
                  <td className="px-3 py-2 tabular-nums">
                    {rate.n(r.minTemperatureC)}–{rate.n(r.maxTemperatureC)} °C
                  </td>
                  <td className="px-3 py-2 tabular-nums">
                    {r.maxWeightG >= 1e6 && r.minWeightG === 0
                      ? t('setup.feed.anySize')
                      : r.maxWeightG >= 1e6
                        ? t('setup.feed.fromWeight', { g: rate.n(r.minWeightG) })
                        : `${rate.n(r.minWeightG)}–${rate.n(r.maxWeightG)} g`}
                  </td>
                  <td className="px-3 py-2 font-bold">{rate.pct(r.pctBodyWeightPerDay)}</td>
                  <td className="px-3 py-2">{rate.days(r.daysPerWeek)}</td>
                  <td className="px-3 py-2 text-sm text-muted">{r.note}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : (
        <div className="flex flex-col gap-3" data-testid="feeding-editor">
          <TextField
            label={t('setup.feed.source')}
            hint={t('setup.feed.sourceHint')}
            value={source}
            onChange={(e) => setSource(e.target.value)}
            error={errors.source}
          />
          <NumberField
            label={t('setup.feed.capLabel')}
            hint={t('setup.feed.capHint')}
            unit="kg/ha"
            value={cap}
            onChange={(e) => setCap(e.target.value)}
            error={errors.maxKgPerHaPerDay}
          />
          <p className="text-sm text-muted">{t('setup.feed.rowsHint')}</p>
          {rows.map((r, i) => (
            <fieldset key={i} className="grid grid-cols-2 gap-3 rounded-xl border-2 border-line bg-paper p-3 md:grid-cols-6">
              <legend className="px-1 text-base font-bold">{t('setup.feed.row', { n: i + 1 })}</legend>
              <NumberField
                label={t('setup.feed.tFrom')}
                unit="°C"
                value={r.minTemperatureC}
                onChange={(e) => setRow(i, 'minTemperatureC', e.target.value)}
                error={errors[`${i}.minTemperatureC`]}
              />
              <NumberField
                label={t('setup.feed.tTo')}
                unit="°C"
                value={r.maxTemperatureC}
                onChange={(e) => setRow(i, 'maxTemperatureC', e.target.value)}
                error={errors[`${i}.maxTemperatureC`]}
              />
              <NumberField
                label={t('setup.feed.wFrom')}
                unit="g"
                value={r.minWeightG}
                onChange={(e) => setRow(i, 'minWeightG', e.target.value)}
                error={errors[`${i}.minWeightG`]}
              />
              <NumberField
                label={t('setup.feed.wTo')}
                unit="g"
                value={r.maxWeightG}
                onChange={(e) => setRow(i, 'maxWeightG', e.target.value)}
                error={errors[`${i}.maxWeightG`]}
              />
              <NumberField
                label={t('setup.feed.pctLabel')}
                unit="%"
                value={r.pctBodyWeightPerDay}
                onChange={(e) => setRow(i, 'pctBodyWeightPerDay', e.target.value)}
                error={errors[`${i}.pctBodyWeightPerDay`]}
              />
              <NumberField
                label={t('setup.feed.daysLabel')}
                value={r.daysPerWeek}
                onChange={(e) => setRow(i, 'daysPerWeek', e.target.value)}
                error={errors[`${i}.daysPerWeek`]}
              />
              <TextField
                containerClassName="col-span-2 md:col-span-5"
                label={t('setup.feed.note')}
                value={r.note}
                onChange={(e) => setRow(i, 'note', e.target.value)}
              />
              <div className="col-span-2 flex items-end md:col-span-1">
                <Button
                  variant="ghost"
                  onClick={() => setRows((rs) => (rs ? rs.filter((_, j) => j !== i) : rs))}
                  disabled={rows.length <= 1}
                >
                  {t('setup.feed.removeRow')}
                </Button>
              </div>
            </fieldset>
          ))}
          <Button
            variant="secondary"
            className="self-start"
            onClick={() =>
              setRows((rs) => [
                ...(rs ?? []),
                {
                  minTemperatureC: '',
                  maxTemperatureC: '',
                  minWeightG: '0',
                  maxWeightG: '1000000',
                  pctBodyWeightPerDay: '',
                  daysPerWeek: '7',
                  note: '',
                  extra: {},
                },
              ])
            }
          >
            {t('setup.feed.addRow')}
          </Button>
          <TextField
            label={t('setup.feed.reason')}
            hint={t('setup.feed.reasonHint')}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
          />
          {update.error ? (
            <Callout tone="danger" live title={t('setup.feed.saveFailed')}>
              {requestErrorText(t, update.error)}
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
            <Button variant="primary" loading={update.isPending} onClick={() => void save()}>
              {t('setup.feed.save')}
            </Button>
          </div>
        </div>
      )}
    </li>
  );
}

/** Feeding tables per species: % body weight by water temperature and fish size, with their source. */
export function FeedingTablesPanel({ farmId, canEdit }: { farmId: string; canEdit: boolean }) {
  const { t } = useTranslation();
  const q = useQuery(setupQueries.feedingTables(farmId));
  if (q.isPending) return <Spinner label={t('setup.loading')} />;
  if (q.isError)
    return (
      <Callout tone="danger" title={t('setup.loadFailed')}>
        {requestErrorText(t, q.error)}
      </Callout>
    );
  return (
    <div className="flex flex-col gap-4" data-testid="feeding-panel">
      <p className="max-w-prose text-base text-muted">{t('setup.feed.intro')}</p>
      <ul className="flex flex-col gap-4">
        {q.data.map((table) => (
          <TableCard key={table.id} farmId={farmId} table={table} canEdit={canEdit} />
        ))}
      </ul>
    </div>
  );
}
