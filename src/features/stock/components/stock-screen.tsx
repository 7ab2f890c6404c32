import type { FarmStockDto, FcrPeriodDto, UnitStockDto } from '@shared/schemas/stock.schema';
import { useQuery } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { stockQueries } from '../api/stock-queries';
import { farmDate, fmt, fmtAuto, speciesName } from '../lib/format';
import { LineChart, type ChartPoint } from './line-chart';
import { StockEventForm } from './stock-event-form';

type Row = FarmStockDto['units'][number];
type SortKey = 'unit' | 'count' | 'biomass' | 'density' | 'fcr';
const T95 = 1.96;

function sortValue(r: Row, k: SortKey): number | string {
  switch (k) {
    case 'unit':
      return r.unit.code;
    case 'count':
      return r.current.count;
    case 'biomass':
      return r.current.biomassKg ?? -1;
    case 'density':
      return r.current.densityKgPerM3 ?? -1;
    case 'fcr':
      return r.latestFcr?.fcr ?? Infinity;
  }
}

function FcrValue({ p }: { p: FcrPeriodDto }) {
  const { t, i18n } = useTranslation();
  const l = i18n.language;
  if (p.fcr === null) return <span className="text-muted">{p.note ?? '—'}</span>;
  return (
    <span>
      <span className="font-bold">{fmt(p.fcr, 2, l)}</span>
      {p.fcr95 ? (
        <span className="block text-sm text-muted">
          {p.fcr95.high === null
            ? t('stock.fcr.rangeOpen', { low: fmt(p.fcr95.low, 2, l) })
            : t('stock.fcr.range', { low: fmt(p.fcr95.low, 2, l), high: fmt(p.fcr95.high, 2, l) })}
        </span>
      ) : null}
    </span>
  );
}

function FarmTable({ data, selectedId, onSelect }: { data: FarmStockDto; selectedId: string | null; onSelect: (id: string) => void }) {
  const { t, i18n } = useTranslation();
  const l = i18n.language;
  const [sort, setSort] = useState<{ key: SortKey; dir: 1 | -1 }>({ key: 'unit', dir: 1 });
  const rows = useMemo(
    () =>
      [...data.units].sort((a, b) => {
        const x = sortValue(a, sort.key);
        const y = sortValue(b, sort.key);
        return (x < y ? -1 : x > y ? 1 : 0) * sort.dir;
      }),
    [data, sort],
  );
  const header = (key: SortKey, align: 'left' | 'right' = 'right') => (
    <th
      scope="col"
      aria-sort={sort.key === key ? (sort.dir === 1 ? 'ascending' : 'descending') : 'none'}
      className={cx('border-b-2 border-line px-2 py-1', align === 'right' ? 'text-right' : 'text-left')}
    >
      <button
        type="button"
        className="inline-flex min-h-10 items-center gap-1 rounded-lg px-1 font-bold hover:bg-abyss-100"
        onClick={() => setSort((s) => ({ key, dir: s.key === key ? (-s.dir as 1 | -1) : key === 'unit' ? 1 : -1 }))}
      >
        {t(`stock.col.${key}`)}
        <span aria-hidden="true" className="text-sm">
          {sort.key === key ? (sort.dir === 1 ? '▲' : '▼') : '↕'}
        </span>
      </button>
    </th>
  );
  return (
    <div className="overflow-x-auto rounded-xl border-2 border-line bg-card">
      <table className="w-full border-collapse text-base" data-testid="stock-table">
        <caption className="sr-only">{t('stock.tableCaption')}</caption>
        <thead className="bg-abyss-50">
          <tr>
            {header('unit', 'left')}
            {header('count')}
            {header('biomass')}
            {header('density')}
            {header('fcr')}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr
              key={r.unit.id}
              className={cx(
                'cursor-pointer border-b border-line last:border-b-0 hover:bg-abyss-50',
                r.unit.id === selectedId && 'bg-ember-50',
              )}
              onClick={() => onSelect(r.unit.id)}
              data-unit-code={r.unit.code}
            >
              <th scope="row" className="px-3 py-2 text-left">
                <button
                  type="button"
                  className="gw-link text-left"
                  onClick={() => onSelect(r.unit.id)}
                  aria-pressed={r.unit.id === selectedId}
                >
                  {r.unit.code}
                </button>
                <span className="block text-sm font-normal text-muted">{speciesName(r.unit.species)}</span>
              </th>
              <td className="px-3 py-2 text-right tabular-nums">{r.current.stocked ? fmt(r.current.count, 0, l) : t('stock.empty')}</td>
              <td className="px-3 py-2 text-right tabular-nums">
                {r.current.biomassKg !== null ? `${fmt(r.current.biomassKg, 0, l)} kg` : '—'}
              </td>
              <td className="px-3 py-2 text-right tabular-nums">
                {r.current.densityKgPerM3 !== null ? fmtAuto(r.current.densityKgPerM3, l) : '—'}
              </td>
              <td className="px-3 py-2 text-right tabular-nums">{r.latestFcr?.fcr != null ? fmt(r.latestFcr.fcr, 2, l) : '—'}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function Figure({ label, value, sub, testId }: { label: string; value: string; sub?: string | null; testId?: string }) {
  return (
    <div className="rounded-xl border-2 border-line bg-card px-3 py-2" data-testid={testId}>
      <p className="text-sm font-bold text-muted">{label}</p>
      <p className="text-2xl font-bold tabular-nums">{value}</p>
      {sub ? <p className="text-sm text-muted">{sub}</p> : null}
    </div>
  );
}

function UnitDetail({
  farmId,
  data,
  timeZone,
  otherUnits,
}: {
  farmId: string;
  data: UnitStockDto;
  timeZone: string;
  otherUnits: ReadonlyArray<{ id: string; code: string; name: string }>;
}) {
  const { t, i18n } = useTranslation();
  const l = i18n.language;
  const [saved, setSaved] = useState<string | null>(null);
  const [allFcr, setAllFcr] = useState(false);
  const [allEvents, setAllEvents] = useState(false);
  const c = data.current;
  const vol = c.volumeM3;
  const biomassPoints: ChartPoint[] = data.history
    .filter((h) => h.after.biomassKg !== null)
    .map((h) => ({
      x: Date.parse(h.after.at),
      y: h.after.biomassKg!,
      ...(h.after.biomassSeKg !== null
        ? { lo: Math.max(0, h.after.biomassKg! - T95 * h.after.biomassSeKg), hi: h.after.biomassKg! + T95 * h.after.biomassSeKg }
        : {}),
      measured: h.event.kind === 'sample_weighing' || h.event.kind === 'stocking',
    }));
  const densityPoints: ChartPoint[] = vol ? biomassPoints.map((p) => ({ x: p.x, y: p.y / vol, measured: p.measured })) : [];
  const dateFmt = (ms: number) => new Intl.DateTimeFormat(l, { timeZone, day: 'numeric', month: 'short' }).format(ms);
  const periods = [...data.fcr.periods].reverse();
  const events = [...data.history].reverse();

  return (
    <div className="flex flex-col gap-5" data-testid="unit-stock" data-unit-code={data.unit.code}>
      <h2 className="text-2xl font-bold">
        {data.unit.code} <span className="font-normal">{data.unit.name}</span>
        {data.unit.species ? <span className="ml-2 text-lg font-normal text-muted">{speciesName(data.unit.species)}</span> : null}
      </h2>
      {c.ageWarning ? (
        <Callout tone="caution" title={t('stock.weighSoon')}>
          {c.ageWarning}
        </Callout>
      ) : null}
      <div className="grid grid-cols-2 gap-3 xl:grid-cols-4">
        <Figure label={t('stock.fig.count')} value={c.stocked ? fmt(c.count, 0, l) : t('stock.empty')} testId="stock-count" />
        <Figure
          label={t('stock.fig.meanWeight')}
          value={c.meanWeightG !== null ? `${fmtAuto(c.meanWeightG, l)} g` : '—'}
          sub={
            c.meanWeightG !== null
              ? [
                  c.meanWeightSeG !== null ? t('stock.fig.se', { se: fmtAuto(c.meanWeightSeG, l), n: c.sampleSize ?? '?' }) : null,
                  c.weightAt ? t('stock.fig.weighed', { date: farmDate(c.weightAt, timeZone, l) }) : null,
                ]
                  .filter(Boolean)
                  .join(' · ')
              : null
          }
        />
        <Figure
          label={t('stock.fig.biomass')}
          value={c.biomassKg !== null ? `${fmt(c.biomassKg, 0, l)} kg` : '—'}
          sub={c.biomass95 ? t('stock.fig.range95', { low: fmt(c.biomass95.lowKg, 0, l), high: fmt(c.biomass95.highKg, 0, l) }) : null}
          testId="stock-biomass"
        />
        <Figure
          label={t('stock.fig.density')}
          value={c.densityKgPerM3 !== null ? `${fmtAuto(c.densityKgPerM3, l)} kg/m³` : '—'}
          sub={c.kgPerHa !== null ? `${fmt(c.kgPerHa, 0, l)} kg/ha` : null}
        />
      </div>

      {biomassPoints.length > 0 ? (
        <section className="gw-card grid gap-4 p-4 lg:grid-cols-2" aria-label={t('stock.charts')}>
          <LineChart points={biomassPoints} label={t('stock.chart.biomass')} unit="kg" format={(v) => fmt(v, 0, l)} formatDate={dateFmt} />
          {densityPoints.length > 0 ? (
            <LineChart
              points={densityPoints}
              label={t('stock.chart.density')}
              unit="kg/m³"
              format={(v) => fmtAuto(v, l)}
              formatDate={dateFmt}
            />
          ) : (
            <p className="self-center text-base text-muted">{t('stock.chart.noVolume')}</p>
          )}
          <p className="text-sm text-muted lg:col-span-2">{t('stock.chart.note')}</p>
        </section>
      ) : null}

      <section className="flex flex-col gap-3" aria-labelledby="fcr-title">
        <h3 id="fcr-title" className="text-xl font-bold">
          {t('stock.fcr.title')}
        </h3>
        {data.fcr.overall ? (
          <p className="text-lg" data-testid="fcr-overall">
            {t('stock.fcr.overall', { from: farmDate(data.fcr.overall.from, timeZone, l), to: farmDate(data.fcr.overall.to, timeZone, l) })}{' '}
            <FcrValue p={data.fcr.overall} />
          </p>
        ) : null}
        {periods.length > 0 ? (
          <div className="overflow-x-auto rounded-xl border-2 border-line bg-card">
            <table className="w-full border-collapse text-base">
              <thead className="bg-abyss-50 text-left">
                <tr>
                  <th scope="col" className="border-b-2 border-line px-3 py-2">
                    {t('stock.fcr.between')}
                  </th>
                  <th scope="col" className="border-b-2 border-line px-3 py-2 text-right">
                    {t('stock.fcr.feed')}
                  </th>
                  <th scope="col" className="border-b-2 border-line px-3 py-2 text-right">
                    {t('stock.fcr.gain')}
                  </th>
                  <th scope="col" className="border-b-2 border-line px-3 py-2 text-right">
                    {t('stock.fcr.fcr')}
                  </th>
                </tr>
              </thead>
              <tbody>
                {(allFcr ? periods : periods.slice(0, 6)).map((p) => (
                  <tr key={`${p.fromEventId}-${p.toEventId}`} className="border-b border-line align-top last:border-b-0 even:bg-paper">
                    <td className="px-3 py-2">
                      {farmDate(p.from, timeZone, l)} – {farmDate(p.to, timeZone, l)}
                      <span className="block text-sm text-muted">{t('stock.fcr.days', { count: Math.round(p.days) })}</span>
                    </td>
                    <td className="px-3 py-2 text-right tabular-nums">{fmt(p.feedKg, 0, l)} kg</td>
                    <td className="px-3 py-2 text-right tabular-nums">
                      {fmt(p.gainKg, 0, l)} kg
                      {p.gainSeKg !== null ? <span className="block text-sm text-muted">± {fmt(T95 * p.gainSeKg, 0, l)}</span> : null}
                    </td>
                    <td className="px-3 py-2 text-right tabular-nums">
                      <FcrValue p={p} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : (
          <p className="text-base text-muted">{t('stock.fcr.none')}</p>
        )}
        {periods.length > 6 ? (
          <Button variant="ghost" className="self-start" onClick={() => setAllFcr((v) => !v)}>
            {allFcr ? t('stock.showFewer') : t('stock.showAll', { count: periods.length })}
          </Button>
        ) : null}
        <p className="text-sm text-muted">{data.fcr.method}</p>
      </section>

      <div className="grid gap-5 xl:grid-cols-2">
        <section className="gw-card p-4" aria-labelledby="stock-form-title">
          <h3 id="stock-form-title" className="mb-3 text-xl font-bold">
            {t('stock.form.title', { unit: data.unit.code })}
          </h3>
          {saved ? (
            <Callout tone="success" live className="mb-3" title={t('stock.form.saved', { kind: t(`stock.kind.${saved}`) })} />
          ) : null}
          <StockEventForm farmId={farmId} unit={data.unit} otherUnits={otherUnits} timeZone={timeZone} onSaved={(k) => setSaved(k)} />
        </section>
        <section className="flex flex-col gap-3" aria-labelledby="events-title">
          <h3 id="events-title" className="text-xl font-bold">
            {t('stock.events.title')}
          </h3>
          <ul className="flex flex-col gap-1.5" data-testid="stock-events">
            {(allEvents ? events : events.slice(0, 10)).map(({ event: e, after }) => (
              <li key={e.id} className="rounded-xl border-2 border-line bg-card px-3 py-2 text-base">
                <p className="flex flex-wrap justify-between gap-2">
                  <span className="font-bold">{t(`stock.kind.${e.kind}`)}</span>
                  <span className="text-muted">{farmDate(e.at, timeZone, l)}</span>
                </p>
                <p className="text-sm">
                  {[
                    e.count !== null ? t('stock.events.fish', { count: e.count, n: fmt(e.count, 0, l) }) : null,
                    e.meanWeightG !== null ? `${fmtAuto(e.meanWeightG, l)} g` : null,
                    e.totalWeightKg !== null ? `${fmtAuto(e.totalWeightKg, l)} kg` : null,
                    e.sampleSize !== null ? t('stock.events.sample', { n: e.sampleSize }) : null,
                  ]
                    .filter(Boolean)
                    .join(' · ')}
                  {' → '}
                  {t('stock.events.after', { n: fmt(after.count, 0, l) })}
                </p>
                {e.note ? <p className="text-sm text-muted">{e.note}</p> : null}
              </li>
            ))}
          </ul>
          {events.length > 10 ? (
            <Button variant="ghost" className="self-start" onClick={() => setAllEvents((v) => !v)}>
              {allEvents ? t('stock.showFewer') : t('stock.showAll', { count: events.length })}
            </Button>
          ) : null}
          {data.notes.length ? (
            <ul className="list-disc pl-5 text-sm text-muted">
              {data.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          ) : null}
        </section>
      </div>
    </div>
  );
}

export interface StockScreenProps {
  farmId: string;
  timeZone: string;
  unitId: string | null;
  onUnit: (unitId: string) => void;
}

/** Stock per unit: fish on record, biomass and density over time, FCR with its uncertainty; record events. */
export function StockScreen({ farmId, timeZone, unitId, onUnit }: StockScreenProps) {
  const { t, i18n } = useTranslation();
  const farm = useQuery(stockQueries.farm(farmId));
  const selected = unitId ?? farm.data?.units[0]?.unit.id ?? null;
  const unit = useQuery({ ...stockQueries.unit(farmId, selected ?? ''), enabled: !!selected });

  if (farm.isPending) return <Spinner label={t('stock.loading')} />;
  if (farm.isError)
    return (
      <Callout tone="danger" title={t('stock.loadFailed')}>
        {requestErrorText(t, farm.error)}
      </Callout>
    );
  const others = farm.data.units
    .filter((u) => u.unit.id !== selected)
    .map((u) => ({ id: u.unit.id, code: u.unit.code, name: u.unit.name }));

  const l = i18n.language;
  return (
    <div className="flex flex-col gap-6" data-testid="stock">
      <nav aria-label={t('stock.pickUnit')} className="-mx-1 overflow-x-auto px-1 pb-1">
        <ul className="flex gap-2">
          {farm.data.units.map((r) => (
            <li key={r.unit.id}>
              <button
                type="button"
                onClick={() => onUnit(r.unit.id)}
                aria-current={r.unit.id === selected ? 'true' : undefined}
                className={cx(
                  'flex min-h-12 flex-col items-start rounded-xl border-2 px-3 py-1 text-left leading-tight',
                  r.unit.id === selected ? 'border-abyss-700 bg-abyss-700 text-white' : 'border-line bg-card hover:border-abyss-500',
                )}
              >
                <span className="font-bold">{r.unit.code}</span>
                <span className={cx('whitespace-nowrap text-sm tabular-nums', r.unit.id === selected ? 'text-abyss-100' : 'text-muted')}>
                  {r.current.biomassKg !== null ? `${fmt(r.current.biomassKg, 0, l)} kg` : t('stock.empty')}
                </span>
              </button>
            </li>
          ))}
        </ul>
      </nav>
      <section>
        {!selected ? null : unit.isPending ? (
          <Spinner label={t('stock.loading')} />
        ) : unit.isError ? (
          <Callout tone="danger" title={t('stock.loadFailed')}>
            {requestErrorText(t, unit.error)}
          </Callout>
        ) : (
          <UnitDetail key={unit.data.unit.id} farmId={farmId} data={unit.data} timeZone={timeZone} otherUnits={others} />
        )}
      </section>
      <section aria-labelledby="stock-all-title" className="flex flex-col gap-3">
        <h2 id="stock-all-title" className="text-xl font-bold">
          {t('stock.allUnits')}
        </h2>
        <FarmTable data={farm.data} selectedId={selected} onSelect={onUnit} />
      </section>
    </div>
  );
}
