import type { WaterTestDto } from '@shared/schemas/water-tests.schema';
import { tanFromReadingMgL, type AmmoniaReadingBasis } from '@shared/chemistry';
import { useMemo } from 'react';
import { useTranslation } from 'react-i18next';
import type uPlot from 'uplot';
import { useDisplay } from '../hooks/use-display';
import { nitriteAsN, yRange } from '../lib/chart-data';
import { chartColours, farmTzDate, timeAxis, valueAxis } from '../lib/chart-theme';
import { formatConcentration, formatFarmDate } from '../lib/format';
import { UPlotChart } from './uplot-chart';

export const CYCLE_WEEKS = 8;

/**
 * The nitrogen cycle of a new or re-started unit: TAN, then nitrite, rising and falling over the weeks
 * while the biofilter establishes (about 4–8 weeks in fresh water; common practice).
 */
export function CycleChart({ tests, timeZone, now = Date.now() }: { tests: readonly WaterTestDto[]; timeZone: string; now?: number }) {
  const { t } = useTranslation();
  const { locale } = useDisplay();
  const model = useMemo(() => {
    const from = now / 1000 - CYCLE_WEEKS * 7 * 86_400;
    const rows = tests
      .filter((x) => x.analyte === 'total_ammonia' || x.analyte === 'nitrite')
      .map((x) => {
        let v: number | null = null;
        if (x.analyte === 'nitrite') v = nitriteAsN(x.value, x.basis);
        else {
          try {
            v = x.result?.tanMgL ?? tanFromReadingMgL({ readingMgL: x.value, basis: x.basis as AmmoniaReadingBasis });
          } catch {
            v = null;
          }
        }
        return { t: Date.parse(x.sampledAt) / 1000, analyte: x.analyte, v };
      })
      .filter((r) => r.t >= from && r.v !== null)
      .sort((a, b) => a.t - b.t);
    const xs = rows.map((r) => r.t);
    // From a day before the first test (at most the last weeks), so the cycle fills the chart.
    const start = rows.length ? Math.max(from, rows[0]!.t - 86_400) : from;
    const tan = rows.map((r) => (r.analyte === 'total_ammonia' ? r.v : null));
    const no2 = rows.map((r) => (r.analyte === 'nitrite' ? r.v : null));
    const first = rows[0]?.t ?? null;
    const lastTan = [...rows].reverse().find((r) => r.analyte === 'total_ammonia')?.v ?? null;
    const lastNo2 = [...rows].reverse().find((r) => r.analyte === 'nitrite')?.v ?? null;
    return { from: start, to: now / 1000, xs, tan, no2, first, lastTan, lastNo2 };
  }, [tests, now]);

  const options = useMemo<Omit<uPlot.Options, 'width' | 'height'>>(() => {
    const yr = yRange([...model.tan, ...model.no2], [0], 0.2) ?? [0, 1];
    return {
      tzDate: farmTzDate(timeZone),
      scales: { x: { time: true, range: () => [model.from, model.to] }, y: { range: () => [0, yr[1]] } },
      axes: [timeAxis(timeZone, locale), valueAxis(t('units.cycle.axis'))],
      series: [
        {},
        {
          label: t('units.cycle.tan'),
          stroke: chartColours.tan,
          width: 2,
          spanGaps: true,
          points: { show: true, size: 8, fill: chartColours.tan },
        },
        {
          label: t('units.cycle.nitrite'),
          stroke: chartColours.nh3,
          width: 2,
          dash: [6, 4],
          spanGaps: true,
          points: { show: true, size: 9, width: 2, fill: '#ffffff', stroke: chartColours.nh3 },
        },
      ],
      legend: { show: false },
      cursor: { y: false },
    };
  }, [model, timeZone, locale, t]);

  const data = useMemo(() => [model.xs, model.tan, model.no2] as uPlot.AlignedData, [model]);

  return (
    <figure className="gw-card flex flex-col gap-2 px-4 py-3" data-testid="chart-cycle">
      <figcaption>
        <span className="block text-lg font-bold">{t('units.cycle.title', { weeks: CYCLE_WEEKS })}</span>
        <span className="block text-base text-muted">{t('units.cycle.explain')}</span>
      </figcaption>
      {model.xs.length === 0 ? (
        <p className="py-8 text-center text-muted">{t('units.cycle.noTests')}</p>
      ) : (
        <UPlotChart options={options} data={data} height={220} />
      )}
      <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-muted" aria-hidden="true">
        <li className="inline-flex items-center gap-1.5">
          <span className="inline-block h-0.5 w-5 bg-abyss-700" />
          {t('units.cycle.tan')}
        </li>
        <li className="inline-flex items-center gap-1.5">
          <span className="inline-block w-5 border-t-2 border-dashed border-ember-600" />
          {t('units.cycle.nitrite')}
        </li>
      </ul>
      <p className="text-base">
        {model.first
          ? t('units.cycle.status', {
              since: formatFarmDate(new Date(model.first * 1000), timeZone, locale),
              tan: model.lastTan === null ? '—' : formatConcentration(model.lastTan, locale),
              nitrite: model.lastNo2 === null ? '—' : formatConcentration(model.lastNo2, locale),
            })
          : null}
      </p>
    </figure>
  );
}
