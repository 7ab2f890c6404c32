import { addDays, localDay } from '@shared/farm-time';
import { recordSections, type RecordsResponse, type RecordTest } from '@shared/schemas/records.schema';
import { useQuery } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Button, buttonClasses } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Select, TextField } from '@/components/ui/field';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { recordQueries, recordsCsvHref, type RecordsPeriod } from '../api/records-queries';

const printCss = `
@media print {
  @page { margin: 12mm; }
  html, body { background: #fff !important; }
  header, nav, footer, .gw-no-print { display: none !important; }
  main { padding: 0 !important; margin: 0 !important; max-width: none !important; }
  .gw-records table { font-size: 9.5pt; }
  .gw-records tr { break-inside: avoid; }
  .gw-records section { break-inside: auto; }
  .gw-records .gw-card { border: 1px solid #000 !important; }
}
`;

const cell = 'border-b border-line px-2.5 py-1.5 align-top';
const head = 'border-b-2 border-line px-2.5 py-2 text-left';

function n(v: number | null | undefined, locale: string, d = 2): string {
  return v === null || v === undefined ? '—' : new Intl.NumberFormat(locale, { maximumFractionDigits: d }).format(v);
}

function Used({ v }: { v: { value: number; source: string; probeLabel: string | null } | null }) {
  const { t, i18n } = useTranslation();
  if (!v) return <>—</>;
  return (
    <>
      {n(v.value, i18n.language)}
      <span className="block text-xs text-muted">
        {t(`records.source.${v.source}`, { defaultValue: v.source })}
        {v.probeLabel ? ` · ${v.probeLabel}` : ''}
      </span>
    </>
  );
}

function Part({ id, title, count, csv, children }: { id: string; title: string; count: number; csv: string; children: ReactNode }) {
  const { t } = useTranslation();
  return (
    <section className="gw-card flex flex-col gap-3 p-4" aria-labelledby={id} data-testid={`records-${id}`}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id={id} className="text-xl font-bold">
          {title} <span className="text-base font-normal text-muted">({count})</span>
        </h2>
        <a href={csv} download className={buttonClasses({ variant: 'ghost', className: 'gw-no-print' })}>
          <Icon name="upload" className="rotate-180" />
          {t('records.csv')}
        </a>
      </div>
      {count === 0 ? <p className="text-base text-muted">{t('records.none')}</p> : <div className="overflow-x-auto">{children}</div>}
    </section>
  );
}

function TestRow({ r }: { r: RecordTest }) {
  const { t, i18n } = useTranslation();
  const l = i18n.language;
  const fa = r.freeAmmonia;
  return (
    <tr>
      <td className={cx(cell, 'whitespace-nowrap tabular-nums')}>{r.sampledAtLocal}</td>
      <td className={cell}>
        {t(`records.analyte.${r.analyte}`, { defaultValue: r.analyte })}
        <span className="block text-xs text-muted">{t(`records.method.${r.method}`, { defaultValue: r.method })}</span>
      </td>
      <td className={cx(cell, 'text-right tabular-nums')}>
        {n(r.value, l, 3)} {r.unit}
        <span className="block text-xs text-muted">{r.basis}</span>
      </td>
      <td className={cx(cell, 'text-right tabular-nums')}>
        {fa?.nh3MgL != null ? (
          <span className="font-bold">{n(fa.nh3MgL, l, 3)}</span>
        ) : fa ? (
          <span className="text-xs text-muted">{t(`records.status.${fa.status}`, { defaultValue: fa.status })}</span>
        ) : (
          '—'
        )}
      </td>
      <td className={cx(cell, 'text-right tabular-nums')}>
        <Used v={fa?.ph ?? null} />
      </td>
      <td className={cx(cell, 'text-right tabular-nums')}>
        <Used v={fa?.temperatureC ?? null} />
      </td>
      <td className={cx(cell, 'text-right tabular-nums')}>
        <Used v={fa?.salinityPpt ?? null} />
      </td>
      <td className={cx(cell, 'text-sm')}>
        {[...(fa?.flags ?? []).map((f) => f.message), r.note].filter(Boolean).join(' · ')}
        <span className="block text-xs text-muted">
          {[r.enteredBy, r.version > 1 ? t('records.edited', { v: r.version }) : null].filter(Boolean).join(' · ')}
        </span>
      </td>
    </tr>
  );
}

function Book({ farmId, book, period }: { farmId: string; book: RecordsResponse; period: RecordsPeriod }) {
  const { t, i18n } = useTranslation();
  const l = i18n.language;
  const csv = (s: (typeof recordSections)[number]) => recordsCsvHref(farmId, s, period);
  const tests = book.waterQuality.reduce((s, u) => s + u.tests.length, 0);
  return (
    <div className="gw-records flex flex-col gap-5" data-testid="records-book">
      <div className="flex flex-col gap-1">
        <h2 className="text-2xl font-bold">{t('records.bookTitle', { farm: book.farm.name })}</h2>
        <p className="text-base">
          {t('records.period', { from: book.period.fromLocal, to: book.period.toLocal, tz: book.farm.timeZone })}
          {' · '}
          {t('records.generated', {
            at: new Intl.DateTimeFormat(l, { timeZone: book.farm.timeZone, dateStyle: 'medium', timeStyle: 'short' }).format(
              new Date(book.generatedAt),
            ),
          })}
        </p>
      </div>
      <ul className="grid grid-cols-2 gap-3 md:grid-cols-5">
        {[
          ['tests', book.totals.tests],
          ['treatments', book.totals.treatments],
          ['mortality', book.totals.mortalityCount],
          ['fed', `${n(book.totals.fedKg, l, 0)} kg`],
          ['withheld', book.totals.withheldRecords],
        ].map(([k, v]) => (
          <li key={k} className="rounded-xl border-2 border-line bg-card px-3 py-2">
            <span className="block text-sm font-bold text-muted">{t(`records.totals.${k}`)}</span>
            <span className="block text-2xl font-bold tabular-nums">{typeof v === 'number' ? n(v, l, 0) : v}</span>
          </li>
        ))}
      </ul>

      <Part id="water_quality" title={t('records.section.water_quality')} count={tests} csv={csv('water_quality')}>
        <div className="flex flex-col gap-5">
          {book.waterQuality
            .filter((u) => u.tests.length > 0)
            .map((u) => (
              <div key={u.unit.id} className="flex flex-col gap-2">
                <h3 className="text-lg font-bold">
                  {u.unit.code} <span className="font-normal">{u.unit.name}</span>
                  {u.maxNh3MgL !== null ? (
                    <span className="ml-2 text-base font-normal text-muted">{t('records.maxNh3', { v: n(u.maxNh3MgL, l, 3) })}</span>
                  ) : null}
                </h3>
                <table className="w-full min-w-[54rem] border-collapse text-sm">
                  <thead className="bg-abyss-50">
                    <tr>
                      <th scope="col" className={head}>
                        {t('records.col.time')}
                      </th>
                      <th scope="col" className={head}>
                        {t('records.col.test')}
                      </th>
                      <th scope="col" className={cx(head, 'text-right')}>
                        {t('records.col.value')}
                      </th>
                      <th scope="col" className={cx(head, 'text-right')}>
                        {t('records.col.nh3')}
                      </th>
                      <th scope="col" className={cx(head, 'text-right')}>
                        {t('records.col.ph')}
                      </th>
                      <th scope="col" className={cx(head, 'text-right')}>
                        {t('records.col.temp')}
                      </th>
                      <th scope="col" className={cx(head, 'text-right')}>
                        {t('records.col.salinity')}
                      </th>
                      <th scope="col" className={head}>
                        {t('records.col.notes')}
                      </th>
                    </tr>
                  </thead>
                  <tbody>
                    {u.tests.map((r) => (
                      <TestRow key={r.testId} r={r} />
                    ))}
                  </tbody>
                </table>
              </div>
            ))}
        </div>
      </Part>

      <Part id="treatments" title={t('records.section.treatments')} count={book.treatments.length} csv={csv('treatments')}>
        <table className="w-full min-w-[44rem] border-collapse text-sm">
          <thead className="bg-abyss-50">
            <tr>
              <th scope="col" className={head}>
                {t('records.col.unit')}
              </th>
              <th scope="col" className={head}>
                {t('records.col.product')}
              </th>
              <th scope="col" className={cx(head, 'text-right')}>
                {t('records.col.dose')}
              </th>
              <th scope="col" className={head}>
                {t('records.col.started')}
              </th>
              <th scope="col" className={head}>
                {t('records.col.withdrawalEnds')}
              </th>
              <th scope="col" className={head}>
                {t('records.col.notes')}
              </th>
            </tr>
          </thead>
          <tbody>
            {book.treatments.map((r) => (
              <tr key={r.id}>
                <td className={cx(cell, 'font-bold')}>{r.unit.code}</td>
                <td className={cell}>{r.productName ?? r.product}</td>
                <td className={cx(cell, 'text-right tabular-nums')}>{r.dose !== null ? `${n(r.dose, l)} ${r.doseUnit ?? ''}` : '—'}</td>
                <td className={cx(cell, 'whitespace-nowrap tabular-nums')}>{r.startsAtLocal}</td>
                <td className={cx(cell, 'whitespace-nowrap tabular-nums')}>
                  {r.withdrawalEndsAtLocal ?? t('records.noWithdrawal')}
                  {r.withdrawalDays !== null ? (
                    <span className="block text-xs text-muted">{t('records.withdrawalDays', { count: r.withdrawalDays })}</span>
                  ) : null}
                  {r.withdrawalDegreeDays !== null ? (
                    <span className="block text-xs text-muted">{t('records.withdrawalDegreeDays', { n: r.withdrawalDegreeDays })}</span>
                  ) : null}
                </td>
                <td className={cx(cell, 'text-sm')}>
                  {r.note}
                  {r.recordedBy ? <span className="block text-xs text-muted">{r.recordedBy}</span> : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Part>

      <Part id="mortalities" title={t('records.section.mortalities')} count={book.mortalities.length} csv={csv('mortalities')}>
        <table className="w-full min-w-[32rem] border-collapse text-sm">
          <thead className="bg-abyss-50">
            <tr>
              <th scope="col" className={head}>
                {t('records.col.time')}
              </th>
              <th scope="col" className={head}>
                {t('records.col.unit')}
              </th>
              <th scope="col" className={cx(head, 'text-right')}>
                {t('records.col.count')}
              </th>
              <th scope="col" className={cx(head, 'text-right')}>
                {t('records.col.weight')}
              </th>
              <th scope="col" className={head}>
                {t('records.col.notes')}
              </th>
            </tr>
          </thead>
          <tbody>
            {book.mortalities.map((r) => (
              <tr key={r.id}>
                <td className={cx(cell, 'whitespace-nowrap tabular-nums')}>{r.atLocal}</td>
                <td className={cx(cell, 'font-bold')}>{r.unit.code}</td>
                <td className={cx(cell, 'text-right tabular-nums')}>{n(r.count, l, 0)}</td>
                <td className={cx(cell, 'text-right tabular-nums')}>{r.totalWeightKg !== null ? `${n(r.totalWeightKg, l)} kg` : '—'}</td>
                <td className={cx(cell, 'text-sm')}>{[r.note, r.recordedBy].filter(Boolean).join(' · ')}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Part>

      <Part id="feeding" title={t('records.section.feeding')} count={book.feeding.length} csv={csv('feeding')}>
        <table className="w-full min-w-[36rem] border-collapse text-sm">
          <thead className="bg-abyss-50">
            <tr>
              <th scope="col" className={head}>
                {t('records.col.day')}
              </th>
              <th scope="col" className={head}>
                {t('records.col.unit')}
              </th>
              <th scope="col" className={cx(head, 'text-right')}>
                {t('records.col.fed')}
              </th>
              <th scope="col" className={head}>
                {t('records.col.reason')}
              </th>
              <th scope="col" className={head}>
                {t('records.col.by')}
              </th>
            </tr>
          </thead>
          <tbody>
            {book.feeding.map((r) => (
              <tr key={r.id} className={r.withheld ? 'bg-watch-soft' : undefined}>
                <td className={cx(cell, 'whitespace-nowrap tabular-nums')}>{r.day}</td>
                <td className={cx(cell, 'font-bold')}>{r.unit.code}</td>
                <td className={cx(cell, 'text-right tabular-nums')}>
                  {r.withheld ? <span className="font-bold">{t('records.withheld')}</span> : `${n(r.fedKg, l, 1)} kg`}
                </td>
                <td className={cx(cell, 'text-sm')}>
                  {r.reason}
                  {r.response ? (
                    <span className="block text-xs text-muted">{t(`records.response.${r.response}`, { defaultValue: r.response })}</span>
                  ) : null}
                </td>
                <td className={cx(cell, 'text-sm')}>{[r.recordedBy, r.fedAtLocal].filter(Boolean).join(' · ')}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Part>
      <p className="text-sm">{t('cautions.thresholds')}</p>
    </div>
  );
}

/** Inspection-ready records of the farm for a period, on screen, on paper and as CSV. */
export function RecordsScreen({ farmId, timeZone }: { farmId: string; timeZone: string }) {
  const { t } = useTranslation();
  const today = localDay(new Date(), timeZone);
  const [from, setFrom] = useState(addDays(today, -29));
  const [to, setTo] = useState(today);
  const [unitId, setUnitId] = useState('');
  const units = useQuery(recordQueries.units(farmId));
  const valid = /^\d{4}-\d{2}-\d{2}$/.test(from) && /^\d{4}-\d{2}-\d{2}$/.test(to) && from <= to;
  const period: RecordsPeriod = { from, to, unitId: unitId || undefined };
  const book = useQuery({ ...recordQueries.book(farmId, period), enabled: valid });

  return (
    <div className="flex flex-col gap-5" data-testid="records">
      <style>{printCss}</style>
      <div className="gw-no-print grid gap-4 sm:grid-cols-2 lg:grid-cols-[1fr_1fr_1.5fr_auto] lg:items-end">
        <TextField label={t('records.from')} type="date" value={from} max={to} onChange={(e) => setFrom(e.target.value)} />
        <TextField label={t('records.to')} type="date" value={to} min={from} max={today} onChange={(e) => setTo(e.target.value)} />
        <Select
          label={t('records.unit')}
          value={unitId}
          onChange={(e) => setUnitId(e.target.value)}
          options={[
            { value: '', label: t('records.allUnits') },
            ...(units.data ?? []).map((u) => ({ value: u.id, label: `${u.code} — ${u.name}` })),
          ]}
        />
        <Button variant="primary" onClick={() => window.print()} icon={<Icon name="report" />} disabled={!book.data}>
          {t('records.print')}
        </Button>
      </div>
      {!valid ? (
        <Callout tone="danger" live>
          {t('records.badPeriod')}
        </Callout>
      ) : book.isPending ? (
        <Spinner label={t('records.loading')} />
      ) : book.isError ? (
        <Callout tone="danger" title={t('records.loadFailed')}>
          {requestErrorText(t, book.error)}
        </Callout>
      ) : (
        <div className={cx(book.isPlaceholderData && 'opacity-60')}>
          <Book farmId={farmId} book={book.data} period={period} />
        </div>
      )}
    </div>
  );
}
