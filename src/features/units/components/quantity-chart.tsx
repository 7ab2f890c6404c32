import type { SeriesDto } from '@shared/schemas/readings.schema';
import { useMemo } from 'react';
import { useTranslation } from 'react-i18next';
import type uPlot from 'uplot';
import { useDisplay } from '../hooks/use-display';
import { bandColumns, limitValues, limitsVisible, seriesStats, yRange, type LimitBand } from '../lib/chart-data';
import { chartColours, farmTzDate, limitZonesHook, timeAxis, valueAxis } from '../lib/chart-theme';
import { formatNumber, formatQuantity, temperatureIn } from '../lib/format';
import { UPlotChart } from './uplot-chart';

export interface QuantityChartProps {
  series: SeriesDto;
  limits: readonly LimitBand[];
  timeZone: string;
  window: { from: Date; to: Date };
  height?: number;
}

/** One probe quantity over the chosen range: the min–max band of each bucket, the average line, suspect buckets as hollow rings, and the profile's limits. */
export function QuantityChart({ series, limits, timeZone, window, height = 220 }: QuantityChartProps) {
  const { t } = useTranslation();
  const { locale, prefs } = useDisplay();
  const isTemp = series.quantity === 'water_temperature';
  const convert = useMemo(
    () => (isTemp ? (v: number) => temperatureIn(v, prefs.temperatureUnit) : (v: number) => v),
    [isTemp, prefs.temperatureUnit],
  );
  const cols = useMemo(() => bandColumns(series, convert), [series, convert]);
  const shownLimits = useMemo(
    () =>
      limits.map((l) =>
        isTemp ? { ...l, watch: l.watch === null ? null : convert(l.watch), act: l.act === null ? null : convert(l.act) } : l,
      ),
    [limits, isTemp, convert],
  );
  const label = t(`units.quantity.${series.quantity}`);
  const unit = isTemp ? `°${prefs.temperatureUnit}` : series.quantity === 'ph' ? '' : series.quantity === 'salinity' ? '‰' : series.unit;
  const stats = seriesStats(cols);

  const yr = useMemo(
    () =>
      yRange([...cols.min, ...cols.max], limitValues(shownLimits), series.quantity === 'ph' ? 0.2 : 0.5) ?? ([0, 1] as [number, number]),
    [cols, shownLimits, series.quantity],
  );
  const options = useMemo<Omit<uPlot.Options, 'width' | 'height'>>(() => {
    const from = window.from.getTime() / 1000;
    const to = window.to.getTime() / 1000;
    return {
      tzDate: farmTzDate(timeZone),
      scales: { x: { time: true, range: () => [from, to] }, y: { range: () => yr } },
      axes: [timeAxis(timeZone, locale), valueAxis(unit ? `${label} (${unit})` : label)],
      series: [
        {},
        { label: t('units.chart.avg'), stroke: chartColours.line, width: 2, points: { show: false } },
        { label: t('units.chart.min'), stroke: chartColours.band, width: 1, points: { show: false } },
        { label: t('units.chart.max'), stroke: chartColours.band, width: 1, points: { show: false } },
        {
          label: t('units.chart.suspect'),
          stroke: chartColours.suspect,
          width: 0,
          paths: () => null,
          points: { show: true, size: 10, width: 2, stroke: chartColours.suspect, fill: '#ffffff' },
        },
      ],
      bands: [{ series: [3, 2], fill: chartColours.band }],
      legend: { show: false },
      cursor: { y: false, points: { size: 8 } },
      hooks: { drawClear: [limitZonesHook(shownLimits, { watch: t('units.chart.watchLimit'), act: t('units.chart.actLimit') })] },
    };
  }, [yr, shownLimits, window, timeZone, locale, unit, label, t]);

  const data = useMemo(() => [cols.x, cols.avg, cols.min, cols.max, cols.suspect] as uPlot.AlignedData, [cols]);
  // Values are already in the reader's unit here (°F converted above).
  const show = (v: number) =>
    isTemp ? `${formatNumber(v, 1, locale)} °${prefs.temperatureUnit}` : formatQuantity(series.quantity, v, locale, prefs);

  return (
    <figure className="gw-card flex flex-col gap-2 px-4 py-3" data-testid={`chart-${series.quantity}`}>
      <figcaption className="flex flex-wrap items-baseline justify-between gap-x-4">
        <span className="text-lg font-bold">{label}</span>
        {stats ? (
          <span className="text-base text-muted">
            {t('units.chart.stats', { min: show(stats.min), max: show(stats.max), latest: show(stats.latest) })}
          </span>
        ) : null}
      </figcaption>
      {cols.x.length === 0 ? (
        <p className="py-8 text-center text-muted">{t('units.chart.noData')}</p>
      ) : (
        <UPlotChart options={options} data={data} height={height} />
      )}
      <p className="sr-only">
        {stats ? t('units.chart.summary', { quantity: label, min: show(stats.min), max: show(stats.max), latest: show(stats.latest) }) : ''}
        {cols.suspectBuckets ? ` ${t('units.chart.suspectCount', { count: cols.suspectBuckets })}` : ''}
      </p>
      <ChartKey suspect={cols.suspectBuckets} limits={limitsVisible(shownLimits, yr)} />
    </figure>
  );
}

export function ChartKey({ suspect, limits }: { suspect: number; limits: boolean }) {
  const { t } = useTranslation();
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-muted" aria-hidden="true">
      <li className="inline-flex items-center gap-1.5">
        <span className="inline-block h-0.5 w-5 bg-abyss-700" />
        {t('units.chart.avg')}
      </li>
      <li className="inline-flex items-center gap-1.5">
        <span className="inline-block h-3 w-5 bg-abyss-300/50" />
        {t('units.chart.range')}
      </li>
      {suspect ? (
        <li className="inline-flex items-center gap-1.5">
          <span className="inline-block size-3 rounded-full border-2 border-watch bg-white" />
          {t('units.chart.suspectKey')}
        </li>
      ) : null}
      {limits ? (
        <>
          <li className="inline-flex items-center gap-1.5">
            <span className="inline-block h-3 w-5 border-t-2 border-dashed border-watch bg-watch-soft" />
            {t('units.chart.watchZone')}
          </li>
          <li className="inline-flex items-center gap-1.5">
            <span className="inline-block h-3 w-5 border-t-2 border-dashed border-act bg-act-soft" />
            {t('units.chart.actZone')}
          </li>
        </>
      ) : null}
    </ul>
  );
}
