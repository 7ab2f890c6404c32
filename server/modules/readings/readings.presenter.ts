import type { SeriesPoint } from '../../../shared/schemas/readings.schema';
import type { BucketRow } from './readings.repository';

const round = (v: number) => Math.round(v * 1e6) / 1e6;

export function presentPoint(r: BucketRow): SeriesPoint {
  return { t: new Date(r.t).toISOString(), avg: round(r.avg), min: r.min, max: r.max, n: r.n, suspect: r.suspect };
}
