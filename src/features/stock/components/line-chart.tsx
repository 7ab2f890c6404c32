import { useId } from 'react';

export interface ChartPoint {
  /** ms since epoch */
  x: number;
  y: number;
  lo?: number;
  hi?: number;
  /** Drawn as a marker (a measured point, e.g. a sample weighing). */
  measured?: boolean;
}

export interface LineChartProps {
  points: readonly ChartPoint[];
  label: string;
  unit: string;
  format: (v: number) => string;
  formatDate: (ms: number) => string;
  height?: number;
}

const W = 560;
const PAD = { top: 14, right: 14, bottom: 34, left: 78 };

function niceTicks(min: number, max: number, count = 4): number[] {
  if (!(max > min)) return [min];
  const raw = (max - min) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? raw;
  const out: number[] = [];
  for (let v = Math.ceil(min / step) * step; v <= max + 1e-9; v += step) out.push(v);
  return out;
}

/**
 * A small step chart drawn as SVG (stock changes at events, so the line holds its value between them),
 * with the 95 % band where the points carry one. The numbers are also in the table beside it.
 */
export function LineChart({ points, label, unit, format, formatDate, height = 220 }: LineChartProps) {
  const titleId = useId();
  if (points.length === 0) return null;
  const xs = points.map((p) => p.x);
  const lows = points.map((p) => p.lo ?? p.y);
  const highs = points.map((p) => p.hi ?? p.y);
  let x0 = Math.min(...xs);
  let x1 = Math.max(...xs);
  if (x1 === x0) {
    x0 -= 86_400_000;
    x1 += 86_400_000;
  }
  const yMin = Math.min(0, ...lows);
  const yMax = Math.max(...highs) * 1.08 || 1;
  const H = height;
  const sx = (x: number) => PAD.left + ((x - x0) / (x1 - x0)) * (W - PAD.left - PAD.right);
  const sy = (y: number) => H - PAD.bottom - ((y - yMin) / (yMax - yMin)) * (H - PAD.top - PAD.bottom);
  /** The vertices of a step line: each value holds until the next point. */
  const stepVertices = (get: (p: ChartPoint) => number): Array<[number, number]> => {
    const out: Array<[number, number]> = [];
    points.forEach((p, i) => {
      out.push([sx(p.x), sy(get(p))]);
      const next = points[i + 1];
      if (next) out.push([sx(next.x), sy(get(p))]);
    });
    return out;
  };
  const toPath = (vs: Array<[number, number]>) => vs.map(([x, y], i) => `${i === 0 ? 'M' : 'L'}${x.toFixed(1)},${y.toFixed(1)}`).join(' ');
  const hasBand = points.some((p) => p.lo !== undefined && p.hi !== undefined);
  const band = hasBand ? `${toPath([...stepVertices((p) => p.hi ?? p.y), ...stepVertices((p) => p.lo ?? p.y).reverse()])} Z` : null;
  const yTicks = niceTicks(yMin, yMax);
  const xTicks = [x0, x0 + (x1 - x0) / 3, x0 + (2 * (x1 - x0)) / 3, x1];
  const last = points[points.length - 1]!;

  return (
    <figure className="flex flex-col gap-1">
      <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-labelledby={titleId}>
        <title id={titleId}>{`${label}: ${format(last.y)} ${unit} (${formatDate(last.x)})`}</title>
        {yTicks.map((v) => (
          <g key={v}>
            <line x1={PAD.left} x2={W - PAD.right} y1={sy(v)} y2={sy(v)} stroke="#dde3e3" />
            <text x={PAD.left - 8} y={sy(v) + 4} textAnchor="end" fontSize="19" fill="#46555c">
              {format(v)}
            </text>
          </g>
        ))}
        {xTicks.map((v, i) => (
          <text
            key={i}
            x={sx(v)}
            y={H - 6}
            textAnchor={i === 0 ? 'start' : i === xTicks.length - 1 ? 'end' : 'middle'}
            fontSize="19"
            fill="#46555c"
          >
            {formatDate(v)}
          </text>
        ))}
        {band ? <path d={band} fill="rgba(134, 184, 186, 0.35)" stroke="none" /> : null}
        <path d={toPath(stepVertices((p) => p.y))} fill="none" stroke="#15525a" strokeWidth="2.5" strokeLinejoin="round" />
        {points.map((p, i) =>
          p.measured ? <circle key={i} cx={sx(p.x)} cy={sy(p.y)} r="4.5" fill="#ffffff" stroke="#15525a" strokeWidth="2" /> : null,
        )}
      </svg>
      <figcaption className="text-sm text-muted">
        {label} ({unit})
      </figcaption>
    </figure>
  );
}
