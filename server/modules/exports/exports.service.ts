import { readingsCsvColumns, resultsCsvColumns, testsCsvColumns, type ExportKind, type ExportQuery } from '../../../shared/schemas/exports.schema';
import { localDay } from '../../../shared/farm-time';
import { notFound, serviceUnavailable } from '../../http/errors';
import { safeFileName, type Cell, type CsvDownload } from './csv-writer';
import { csvHeader, readingCells, resultCells, testCells } from './exports.presenter';
import type { ExportsRepository } from './exports.repository';

/** Downloads hold a database connection while they stream; at most this many run at once per process. */
const MAX_CONCURRENT = 4;

export class ExportsService {
  private active = 0;

  constructor(private readonly repo: ExportsRepository) {}

  private async scope(farmId: string, q: ExportQuery) {
    const farm = await this.repo.findFarm(farmId);
    if (!farm) throw notFound('Farm');
    const unit = q.unitId ? await this.repo.findUnit(farmId, q.unitId) : null;
    if (q.unitId && !unit) throw notFound('Unit');
    return { farm, unit };
  }

  private slot(): () => void {
    if (this.active >= MAX_CONCURRENT) throw serviceUnavailable('Several downloads are already running; try again in a minute.');
    this.active++;
    let released = false;
    return () => {
      if (!released) this.active--;
      released = true;
    };
  }

  private fileName(kind: ExportKind, farmSlug: string, unitCode: string | null, q: ExportQuery, timeZone: string): string {
    const last = new Date(q.to.getTime() - 1);
    return safeFileName([farmSlug, unitCode ?? '', kind, localDay(q.from, timeZone), localDay(last, timeZone)]);
  }

  /** Probe readings: one row per probe sample, probes in unit-code order, times ascending. */
  async readings(farmId: string, q: ExportQuery): Promise<CsvDownload> {
    const { farm, unit } = await this.scope(farmId, q);
    const probes = await this.repo.probes(farmId, unit?.id ?? null);
    const repo = this.repo;
    async function* rows(): AsyncGenerator<Cell[]> {
      for (const { probe, unitCode } of probes) {
        for await (const batch of repo.readingSamples(probe.id, q.from, q.to, farm.timeZone)) {
          for (const r of batch) yield readingCells(r, unitCode, probe.label, probe.probeKey);
        }
      }
    }
    return this.download('readings', farm, unit?.code ?? null, q, readingsCsvColumns, rows());
  }

  /** Kit and meter results, oldest first. */
  async tests(farmId: string, q: ExportQuery): Promise<CsvDownload> {
    const { farm, unit } = await this.scope(farmId, q);
    const batches = this.repo.tests(farmId, unit?.id ?? null, q.from, q.to, farm.timeZone);
    async function* rows(): AsyncGenerator<Cell[]> {
      for await (const batch of batches) for (const t of batch) yield testCells(t);
    }
    return this.download('tests', farm, unit?.code ?? null, q, testsCsvColumns, rows());
  }

  /** Computed free-ammonia results with the values used and their sources, oldest first. */
  async results(farmId: string, q: ExportQuery): Promise<CsvDownload> {
    const { farm, unit } = await this.scope(farmId, q);
    const batches = this.repo.results(farmId, unit?.id ?? null, q.from, q.to, farm.timeZone);
    async function* rows(): AsyncGenerator<Cell[]> {
      for await (const batch of batches) for (const r of batch) yield resultCells(r);
    }
    return this.download('results', farm, unit?.code ?? null, q, resultsCsvColumns, rows());
  }

  private download(
    kind: ExportKind,
    farm: { slug: string; timeZone: string },
    unitCode: string | null,
    q: ExportQuery,
    columns: readonly string[],
    rows: AsyncIterable<Cell[]>,
  ): CsvDownload {
    const done = this.slot();
    return { fileName: this.fileName(kind, farm.slug, unitCode, q, farm.timeZone), header: csvHeader(columns, farm.timeZone), rows, done };
  }
}
