import type { FreeAmmoniaResultDto, WaterTestDto } from '@shared/schemas/water-tests.schema';
import { tanFromReadingMgL, type AmmoniaReadingBasis } from '@shared/chemistry';
import { useMemo } from 'react';
import { useTranslation } from 'react-i18next';
import type uPlot from 'uplot';
import { useDisplay } from '../hooks/use-display';
import { limitValues, yRange, type LimitBand } from '../lib/chart-data';
import { chartColours, farmTzDate, limitZonesHook, timeAxis, valueAxis } from '../lib/chart-theme';
import { formatConcentration } from '../lib/format';
import { UPlotChart } from './uplot-chart';

/** NH3-N ↔ NH3 by molar mass (14.007 g N, 17.031 g NH3): computed. */
const NH3_PER_N = 17.031 / 14.007;

export interface EpaLines {
  cmcMgL: number | null;
  cccMgL: number | null;
}

export interface AmmoniaChartProps {
  tests: readonly WaterTestDto[];
  latest: FreeAmmoniaResultDto | null;
  limits: readonly LimitBand[];
  epa: EpaLines | null;
  timeZone: string;
  window: { from: Date; to: Date };
}

function tanOf(test: WaterTestDto): number | null {
  if (test.result?.tanMgL != null) return test.result.tanMgL;
  try {
    return tanFromReadingMgL({ readingMgL: test.value, basis: test.basis as AmmoniaReadingBasis });
  } catch {
    return null;
  }
}

/**
 * Kit TAN (left axis) and the computed free ammonia (right axis) as points, the profile's NH3 limits
 * behind them, the EPA 2013 criteria as reference lines on the TAN axis, and today's forecast peak.
 */
export function AmmoniaChart({ tests, latest, limits, epa, timeZone, window }: AmmoniaChartProps) {
  const { t } = useTranslation();
  const { locale, prefs } = useDisplay();
  const asN = prefs.ammoniaBasis === 'nh3-n';
  const nh3Unit = asN ? t('units.unit.nh3n') : t('units.unit.nh3');

  const model = useMemo(() => {
    const from = window.from.getTime() / 1000;
    let to = window.to.getTime() / 1000;
    const rows = tests
      .filter((x) => x.analyte === 'total_ammonia')
      .map((x) => ({
        t: Date.parse(x.sampledAt) / 1000,
        tan: tanOf(x),
        nh3: (asN ? x.result?.nh3NMgL : x.result?.nh3MgL) ?? null,
      }))
      .filter((r) => r.t >= from && r.t <= to)
      .sort((a, b) => a.t - b.t);
    const peak = latest?.forecastPeak ?? null;
    const peakT = peak ? Date.parse(peak.at) / 1000 : null;
    const peakV = peak ? (asN ? peak.nh3NMgL : peak.nh3MgL) : null;
    const showPeak = peakT !== null && peakT >= from && peakT <= to + 86_400;
    if (showPeak && peakT! > to) to = peakT! + 3600;
    const xs = rows.map((r) => r.t);
    const tan = rows.map((r) => r.tan);
    const nh3 = rows.map((r) => r.nh3);
    const fc: (number | null)[] = rows.map(() => null);
    if (showPeak) {
      const i = xs.findIndex((x) => x > peakT!);
      const at = i === -1 ? xs.length : i;
      xs.splice(at, 0, peakT!);
      tan.splice(at, 0, null);
      nh3.splice(at, 0, null);
      fc.splice(at, 0, peakV);
    }
    // Limits are written in NH3 or NH3-N; show them in the reader's basis.
    const nh3Limits = limits.map((l) => {
      const f = l.basis.endsWith('NH3-N') ? (asN ? 1 : NH3_PER_N) : asN ? 1 / NH3_PER_N : 1;
      return { ...l, watch: l.watch === null ? null : l.watch * f, act: l.act === null ? null : l.act * f };
    });
    return { from, to, xs, tan, nh3, fc, showPeak, peakV, nh3Limits, count: rows.length };
  }, [tests, latest, limits, window, asN]);

  const options = useMemo<Omit<uPlot.Options, 'width' | 'height'>>(() => {
    const epaValues = [epa?.cccMgL, epa?.cmcMgL].filter((v): v is number => typeof v === 'number');
    const tanRange = yRange(model.tan, epaValues, 0.2) ?? [0, 1];
    const nh3Range = yRange([...model.nh3, ...model.fc], limitValues(model.nh3Limits), 0.01) ?? [0, 0.1];
    const epaHook = (u: uPlot) => {
      if (!epa) return;
      const { ctx } = u;
      const { left, top, width, height } = u.bbox;
      ctx.save();
      ctx.setLineDash([2, 3]);
      ctx.lineWidth = 2 * devicePixelRatio;
      ctx.strokeStyle = chartColours.epa;
      ctx.fillStyle = chartColours.epa;
      ctx.font = `bold ${12 * devicePixelRatio}px "Atkinson Hyperlegible", sans-serif`;
      for (const [v, word] of [
        [epa.cmcMgL, t('units.epa.cmcShort')],
        [epa.cccMgL, t('units.epa.cccShort')],
      ] as const) {
        if (v === null) continue;
        const y = u.valToPos(v, 'tan', true);
        if (y < top || y > top + height) continue;
        ctx.beginPath();
        ctx.moveTo(left, y);
        ctx.lineTo(left + width, y);
        ctx.stroke();
        const text = word;
        ctx.fillText(text, left + width - ctx.measureText(text).width - 6 * devicePixelRatio, y - 4 * devicePixelRatio);
      }
      ctx.restore();
    };
    return {
      tzDate: farmTzDate(timeZone),
      scales: {
        x: { time: true, range: () => [model.from, model.to] },
        tan: { range: () => [Math.max(0, tanRange[0]), tanRange[1]] },
        nh3: { range: () => [Math.max(0, nh3Range[0]), nh3Range[1]] },
      },
      axes: [
        timeAxis(timeZone, locale),
        valueAxis(t('units.chart.tanAxis'), { scale: 'tan', side: 3 }),
        valueAxis(t('units.chart.nh3Axis', { unit: nh3Unit }), { scale: 'nh3', side: 1, grid: { show: false }, size: 64 }),
      ],
      series: [
        {},
        {
          label: t('units.chart.tan'),
          scale: 'tan',
          stroke: chartColours.tan,
          width: 1.5,
          spanGaps: true,
          points: { show: true, size: 9, fill: chartColours.tan, stroke: chartColours.tan },
        },
        {
          label: t('units.chart.nh3'),
          scale: 'nh3',
          stroke: chartColours.nh3,
          width: 1.5,
          dash: [6, 4],
          spanGaps: true,
          points: { show: true, size: 11, width: 3, fill: '#ffffff', stroke: chartColours.nh3 },
        },
        {
          label: t('units.chart.forecast'),
          scale: 'nh3',
          stroke: chartColours.forecast,
          paths: () => null,
          points: { show: true, size: 14, width: 3, fill: '#ffffff', stroke: chartColours.forecast },
        },
      ],
      legend: { show: false },
      cursor: { y: false },
      hooks: {
        drawClear: [limitZonesHook(model.nh3Limits, { watch: t('units.chart.nh3Watch'), act: t('units.chart.nh3Act') }, 'nh3')],
        draw: [epaHook],
      },
    };
  }, [model, epa, timeZone, locale, nh3Unit, t]);

  const data = useMemo(() => [model.xs, model.tan, model.nh3, model.fc] as uPlot.AlignedData, [model]);

  return (
    <figure className="gw-card flex flex-col gap-2 px-4 py-3" data-testid="chart-ammonia">
      <figcaption className="flex flex-wrap items-baseline justify-between gap-x-4">
        <span className="text-lg font-bold">{t('units.chart.ammoniaTitle')}</span>
        <span className="text-base text-muted">{t('units.chart.testCount', { count: model.count })}</span>
      </figcaption>
      {model.xs.length === 0 ? (
        <p className="py-8 text-center text-muted">{t('units.chart.noTests')}</p>
      ) : (
        <UPlotChart options={options} data={data} height={240} />
      )}
      <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-muted" aria-hidden="true">
        <li className="inline-flex items-center gap-1.5">
          <span className="inline-block size-3 rounded-full bg-abyss-700" />
          {t('units.chart.tan')}
        </li>
        <li className="inline-flex items-center gap-1.5">
          <span className="inline-block size-3.5 rounded-full border-[3px] border-ember-600 bg-white" />
          {t('units.chart.nh3')}
        </li>
        {model.showPeak ? (
          <li className="inline-flex items-center gap-1.5">
            <span className="inline-block size-4 rounded-full border-[3px] border-ember-500 bg-white" />
            {t('units.chart.forecastKey', { value: formatConcentration(model.peakV ?? 0, locale), unit: nh3Unit })}
          </li>
        ) : null}
        {epa ? (
          <li className="inline-flex items-center gap-1.5">
            <span className="inline-block w-5 border-t-2 border-dotted border-abyss-900" />
            {t('units.epa.key')}
          </li>
        ) : null}
        {model.nh3Limits.length ? (
          <li className="inline-flex items-center gap-1.5">
            <span className="inline-block h-3 w-5 border-t-2 border-dashed border-act bg-act-soft" />
            {t('units.chart.nh3Zones')}
          </li>
        ) : null}
      </ul>
    </figure>
  );
}
