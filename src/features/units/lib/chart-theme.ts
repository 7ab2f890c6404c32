import uPlot from 'uplot';

/** Chart colours from the house theme (src/index.css). Canvas needs literal colours. */
export const chartColours = {
  ink: '#142127',
  muted: '#46555c',
  grid: '#dde3e3',
  line: '#15525a', // abyss-700
  band: 'rgba(134, 184, 186, 0.35)', // abyss-300
  suspect: '#9c5d00', // watch
  watchZone: 'rgba(252, 235, 196, 0.75)', // watch-soft
  actZone: 'rgba(249, 220, 216, 0.8)', // act-soft
  watchLine: '#9c5d00',
  actLine: '#b1261c',
  tan: '#15525a',
  nh3: '#b8701a', // ember-600
  nitrite: '#5a666d', // silent
  forecast: '#e0922a', // ember-500
  epa: '#0b3036', // abyss-900
} as const;

export const chartFont = '14px "Atkinson Hyperlegible", ui-sans-serif, system-ui, sans-serif';
export const chartFontBold = 'bold 13px "Atkinson Hyperlegible", ui-sans-serif, system-ui, sans-serif';

/** uPlot lays its time ticks out in the farm's time zone (midnight is the farm's midnight). */
export function farmTzDate(timeZone: string): (ts: number) => Date {
  return (ts) => uPlot.tzDate(new Date(ts * 1000), timeZone);
}

/** Time axis labels in the farm's time zone and the reader's language: clock times up to a day apart, dates beyond. */
export function timeAxis(timeZone: string, locale: string): uPlot.Axis {
  const clock = new Intl.DateTimeFormat(locale, { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
  const day = new Intl.DateTimeFormat(locale, { timeZone, day: 'numeric', month: 'short' });
  return {
    stroke: chartColours.muted,
    font: chartFont,
    // At least 72 px between labels, so a week never gets two labels per day.
    space: 72,
    grid: { stroke: chartColours.grid, width: 1 },
    ticks: { stroke: chartColours.grid, width: 1 },
    values: (_u, splits, _axis, _space, incr) => splits.map((s) => (incr >= 86_400 ? day : clock).format(new Date(s * 1000))),
  };
}

export function valueAxis(label: string, opts: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    stroke: chartColours.muted,
    font: chartFont,
    labelFont: chartFontBold,
    label,
    labelSize: 22,
    size: 56,
    grid: { stroke: chartColours.grid, width: 1 },
    ticks: { stroke: chartColours.grid, width: 1 },
    ...opts,
  };
}

/** Draws the watch and act zones of a limit behind the series, with a labelled line at each limit. */
export function limitZonesHook(
  limits: ReadonlyArray<{ direction: 'upper' | 'lower'; watch: number | null; act: number | null }>,
  labels: { watch: string; act: string },
  scaleKey = 'y',
): (u: uPlot) => void {
  return (u) => {
    const { ctx } = u;
    const { left, top, width, height } = u.bbox;
    const ys = (v: number) => u.valToPos(v, scaleKey, true);
    const clampY = (y: number) => Math.min(Math.max(y, top), top + height);
    ctx.save();
    for (const l of limits) {
      const edge = l.direction === 'upper' ? top : top + height;
      const zone = (from: number, to: number, fill: string) => {
        const a = clampY(from);
        const b = clampY(to);
        if (Math.abs(b - a) < 0.5) return;
        ctx.fillStyle = fill;
        ctx.fillRect(left, Math.min(a, b), width, Math.abs(b - a));
      };
      if (l.watch !== null) zone(ys(l.watch), l.act !== null ? ys(l.act) : edge, chartColours.watchZone);
      if (l.act !== null) zone(ys(l.act), edge, chartColours.actZone);
    }
    ctx.setLineDash([6, 4]);
    ctx.lineWidth = 1.5 * devicePixelRatio;
    ctx.font = `bold ${12 * devicePixelRatio}px "Atkinson Hyperlegible", sans-serif`;
    for (const l of limits) {
      for (const [v, colour, word] of [
        [l.watch, chartColours.watchLine, labels.watch],
        [l.act, chartColours.actLine, labels.act],
      ] as const) {
        if (v === null) continue;
        const y = ys(v);
        if (y < top || y > top + height) continue;
        ctx.strokeStyle = colour;
        ctx.beginPath();
        ctx.moveTo(left, y);
        ctx.lineTo(left + width, y);
        ctx.stroke();
        ctx.fillStyle = colour;
        ctx.fillText(word, left + 6 * devicePixelRatio, y - 4 * devicePixelRatio);
      }
    }
    ctx.restore();
  };
}
