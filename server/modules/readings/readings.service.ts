import { canonicalUnit, quantities as allQuantities, type Quantity } from '../../../shared/schemas/mqtt.schema';
import type { SeriesDto, SeriesQuery, SeriesResponse } from '../../../shared/schemas/readings.schema';
import { notFound } from '../../http/errors';
import type { LatestReadingRow, ReadingsRepository } from './readings.repository';
import { presentPoint } from './readings.presenter';

// Bucket widths a chart axis reads well: seconds up to a day, then whole days.
const NICE_SECONDS = [1, 2, 5, 10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600, 7200, 10800, 14400, 21600, 28800, 43200, 86400];

/**
 * The smallest readable bucket width such that [from, to) spans at most `maxPoints` epoch-aligned
 * buckets. An aligned range of R seconds touches at most ceil(R / b) + 1 buckets, so b ≥ R / (maxPoints − 1).
 */
export function bucketSecondsFor(from: Date, to: Date, maxPoints: number): number {
  const rangeSeconds = (to.getTime() - from.getTime()) / 1000;
  const need = rangeSeconds / Math.max(1, maxPoints - 1);
  const nice = NICE_SECONDS.find((s) => s >= need);
  return nice ?? Math.ceil(need / 86400) * 86400;
}

/** Derived quantities a probe's readings may carry besides those it reports (ingest derives salinity from conductivity). */
function storedQuantities(reported: readonly string[]): Quantity[] {
  const set = new Set(reported.filter((q): q is Quantity => (allQuantities as readonly string[]).includes(q)));
  if (set.has('conductivity') || set.has('specific_conductance')) set.add('salinity');
  return allQuantities.filter((q) => set.has(q));
}

export class ReadingsService {
  constructor(private readonly repo: ReadingsRepository) {}

  /**
   * A unit's probe series, downsampled in SQL to at most `maxPoints` per quantity: raw readings when
   * the range holds no more than that, else epoch-aligned buckets with avg/min/max/n/suspect.
   */
  async series(farmId: string, unitId: string, q: SeriesQuery): Promise<SeriesResponse> {
    const probes = await this.repo.unitProbes(farmId, unitId);
    if (!probes) throw notFound('Unit');
    const probeIds = probes.map((p) => p.id);
    const wanted = q.quantities ?? storedQuantities(probes.flatMap((p) => p.quantities));
    const series: SeriesDto[] = [];
    for (const quantity of wanted) {
      if (!probeIds.length) {
        series.push({ quantity, unit: canonicalUnit[quantity], bucketSeconds: 0, readings: 0, points: [] });
        continue;
      }
      const capped = await this.repo.countUpTo(probeIds, quantity, q.from, q.to, q.maxPoints + 1);
      const raw = capped <= q.maxPoints;
      const bucketSeconds = raw ? 0 : bucketSecondsFor(q.from, q.to, q.maxPoints);
      const rows = raw
        ? await this.repo.rawPoints(probeIds, quantity, q.from, q.to)
        : await this.repo.bucketPoints(probeIds, quantity, q.from, q.to, bucketSeconds);
      series.push({
        quantity,
        unit: canonicalUnit[quantity],
        bucketSeconds,
        readings: rows.reduce((sum, r) => sum + r.n, 0),
        points: rows.map(presentPoint),
      });
    }
    return { unitId, from: q.from.toISOString(), to: q.to.toISOString(), maxPoints: q.maxPoints, probeIds, series };
  }

  /** Newest reading per (active probe, quantity) for the units of a farm (farm map). */
  latestForFarm(farmId: string): Promise<LatestReadingRow[]> {
    return this.repo.latestForFarm(farmId, allQuantities);
  }

  /** Newest usable reading of `quantity` among the unit's probes (flow for the raceway load, for instance). */
  latestForUnit(unitId: string, quantity: Quantity): Promise<{ probeId: string; at: Date; value: number } | null> {
    return this.repo.latestForUnit(unitId, quantity);
  }
}
