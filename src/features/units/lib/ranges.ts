export const chartRanges = ['24h', '7d', '30d', '90d'] as const;
export type ChartRange = (typeof chartRanges)[number];

const HOUR = 3_600_000;
const spans: Record<ChartRange, number> = { '24h': 24 * HOUR, '7d': 7 * 24 * HOUR, '30d': 30 * 24 * HOUR, '90d': 90 * 24 * HOUR };

export function isChartRange(v: unknown): v is ChartRange {
  return typeof v === 'string' && (chartRanges as readonly string[]).includes(v);
}

/** The window a range covers, ending now (rounded to the minute so a refetch asks the same question). */
export function rangeWindow(range: ChartRange, now: number = Date.now()): { from: Date; to: Date } {
  const to = Math.ceil(now / 60_000) * 60_000;
  return { from: new Date(to - spans[range]), to: new Date(to) };
}

export function rangeSpanMs(range: ChartRange): number {
  return spans[range];
}
