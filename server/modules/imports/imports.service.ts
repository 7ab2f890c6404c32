import { randomUUID } from 'node:crypto';
import { mkdir, readdir, rename, rm, stat, utimes, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { importLimits, type ImportCommitRequest, type ImportMapping, type ImportReject, type ImportWarning } from '../../../shared/schemas/imports.schema';
import { jobs } from '../../../shared/schemas/jobs.schema';
import { analyteRules, type CreateWaterTest } from '../../../shared/schemas/water-tests.schema';
import { AppError, badRequest, conflict, notFound, payloadTooLarge, validationError } from '../../http/errors';
import type { Logger } from '../../lib/logger';
import type { Queues } from '../../queues';
import { isTimeZone, looksLikeDataRow, suggestMapping, uniqueHeaders, unknownColumns } from './column-mapping';
import { readRows, sniffFile, type CsvRow } from './csv-file';
import { SESSION_TTL_SECONDS, type ImportSession, type ImportSessionStore, type SessionLock } from './import-sessions.store';
import type { ImportedTestRow, ImportsRepository, ImportWriter } from './imports.repository';
import { clientIdFor, importIdFor, mappingKey, rowChecker, type RowChecker } from './row-check';

/** Where the audit entry of a committed import goes (the audit module's service in the container). */
export type ImportAudit = {
  record(entry: {
    farmId: string | null;
    actorId: string | null;
    action: string;
    entity: string;
    entityId: string | null;
    before?: Record<string, unknown> | null;
    after?: Record<string, unknown> | null;
  }): Promise<unknown>;
};

export type ImportsConfig = {
  /** Folder for uploaded files (DATA_DIR/uploads/imports); files are named by import id only. */
  uploadDir: string;
  maxRows?: number;
  /** How long POST …/validate waits for the result before answering 202 with the running state. */
  validateWaitMs?: number;
  batchSize?: number;
};

export type UploadResult = {
  session: ImportSession;
  preview: CsvRow[];
  suggestion: ReturnType<typeof suggestMapping>['mapping'];
  warnings: ImportWarning[];
  existing: boolean;
};

export type ImportStatusView = { session: ImportSession; rejects: ImportReject[]; page: { offset: number; limit: number; total: number } };

const PROGRESS_EVERY_ROWS = 500;
const PROGRESS_EVERY_MS = 250;
const LOCK_REFRESH_MS = 5_000;
const QUEUE_CHUNK = 500;

/** Thrown inside the commit transaction to roll it back when rows are rejected and may not be skipped. */
class RejectedRowsFound extends Error {}

const displayName = (name: string) =>
  (name.split(/[\\/]/).pop() ?? '')
    .replace(/[\u0000-\u001f\u007f]/g, '')
    .trim()
    .slice(0, 255) || 'upload.csv';

export class ImportsService {
  private readonly running = new Set<Promise<void>>();
  private readonly maxRows: number;
  private readonly validateWaitMs: number;
  private readonly batchSize: number;

  constructor(
    private readonly repo: ImportsRepository,
    private readonly store: ImportSessionStore,
    private readonly queues: Queues,
    private readonly audit: ImportAudit,
    private readonly logger: Logger,
    private readonly config: ImportsConfig,
  ) {
    this.maxRows = config.maxRows ?? importLimits.maxRows;
    this.validateWaitMs = config.validateWaitMs ?? 2_500;
    this.batchSize = config.batchSize ?? 1000;
  }

  /** Folder multer writes incoming files to; they are renamed to the import id once checked. */
  get incomingDir(): string {
    return join(this.config.uploadDir, 'incoming');
  }

  private filePath(importId: string): string {
    return join(this.config.uploadDir, `${importId}.csv`);
  }

  /** Takes an uploaded file (already on disk under a server-chosen name); the file is moved or removed. */
  async uploadFile(farmId: string, userId: string | null, file: { path: string; fileName: string }): Promise<UploadResult> {
    try {
      return await this.ingest(farmId, userId, file.path, displayName(file.fileName));
    } finally {
      await rm(file.path, { force: true });
    }
  }

  /** The JSON alternative: pasted CSV text. */
  async uploadText(farmId: string, userId: string | null, fileName: string, csv: string): Promise<UploadResult> {
    await mkdir(this.incomingDir, { recursive: true });
    const path = join(this.incomingDir, `${randomUUID()}.part`);
    await writeFile(path, csv, 'utf8');
    return this.uploadFile(farmId, userId, { path, fileName });
  }

  private async ingest(farmId: string, userId: string | null, path: string, fileName: string): Promise<UploadResult> {
    const farm = await this.repo.findFarm(farmId);
    if (!farm) throw notFound('Farm');
    void this.sweepOldFiles();
    const { delimiter, sizeBytes } = await sniffFile(path);
    const reader = readRows(path, delimiter);
    let header: CsvRow | null = null;
    const preview: CsvRow[] = [];
    let totalRows = 0;
    for await (const row of reader.rows) {
      if (!header) {
        header = row;
        if (row.cells.length > importLimits.maxColumns) {
          throw badRequest(`The file has ${row.cells.length} columns; at most ${importLimits.maxColumns} are read.`, { columns: row.cells.length }, 'too_many_columns');
        }
        if (looksLikeDataRow(row.cells)) {
          throw badRequest(
            `The first line looks like data ("${row.cells.slice(0, 4).join(', ')}"), not column names. Add a header row, for example: unit,sampled_at,analyte,method,basis,value`,
            { line: row.line },
            'missing_header',
          );
        }
        continue;
      }
      totalRows++;
      if (totalRows > this.maxRows) {
        throw payloadTooLarge(`The file has more than ${this.maxRows.toLocaleString('en-US')} rows. Split it into smaller files.`);
      }
      if (preview.length < importLimits.previewRows) preview.push(row);
    }
    if (!header) throw badRequest('The file has no rows.', undefined, 'empty_file');
    if (!totalRows) throw badRequest('The file has a header row but no data rows.', { line: header.line }, 'no_rows');
    const { headers, warnings } = uniqueHeaders(header.cells);
    const importId = importIdFor(farmId, reader.sha256());
    await rename(path, this.filePath(importId));
    const previous = await this.store.get(farmId, importId);
    let session: ImportSession;
    if (previous) {
      await this.store.touch(farmId, importId);
      session = previous;
    } else {
      const now = new Date().toISOString();
      session = {
        importId,
        farmId,
        createdById: userId,
        fileName,
        sizeBytes,
        sha256: reader.sha256(),
        delimiter,
        headers,
        warnings,
        totalRows,
        state: 'uploaded',
        processedRows: 0,
        acceptedRows: 0,
        rejectedRows: 0,
        mapping: null,
        mappingKey: null,
        commit: null,
        error: null,
        createdAt: now,
        updatedAt: now,
      };
      await this.store.create(session);
    }
    const suggestion = suggestMapping(
      headers,
      preview.map((r) => r.cells),
      farm.timeZone,
    );
    return { session, preview, suggestion: suggestion.mapping, warnings: [...warnings, ...suggestion.warnings], existing: Boolean(previous) };
  }

  /** Removes uploaded files whose import has expired (24 h after its last change). */
  private async sweepOldFiles(): Promise<void> {
    try {
      const cutoff = Date.now() - SESSION_TTL_SECONDS * 1000 - 3600_000;
      for (const dir of [this.config.uploadDir, this.incomingDir]) {
        const names = await readdir(dir).catch(() => [] as string[]);
        for (const name of names) {
          const p = join(dir, name);
          const s = await stat(p).catch(() => null);
          if (s?.isFile() && s.mtimeMs < cutoff) await rm(p, { force: true });
        }
      }
    } catch (err) {
      this.logger.warn({ err }, 'import upload sweep failed');
    }
  }

  private async session(farmId: string, importId: string): Promise<ImportSession> {
    const s = await this.store.get(farmId, importId);
    if (!s) throw notFound('Import');
    // A run whose lock is gone without a final state was cut short (the process stopped); its
    // transaction was rolled back, so nothing of it is stored.
    if ((s.state === 'validating' || s.state === 'committing') && !(await this.store.isLocked(farmId, importId))) {
      const error = { code: 'interrupted', message: 'The server stopped while this import was running; nothing of that run was stored. Run it again.' };
      await this.store.update(farmId, importId, { state: 'failed', error });
      return { ...s, state: 'failed', error };
    }
    return s;
  }

  async status(farmId: string, importId: string, page: { offset: number; limit: number }): Promise<ImportStatusView> {
    const session = await this.session(farmId, importId);
    const { items, total } = await this.store.rejects(farmId, importId, page.offset, page.limit);
    return { session, rejects: items, page: { offset: page.offset, limit: page.limit, total } };
  }

  private checkMapping(session: ImportSession, mapping: ImportMapping): void {
    const missing = unknownColumns(mapping, session.headers);
    if (missing.length) {
      throw validationError(
        { fieldErrors: { mapping: missing.map((c) => `the file has no column "${c}"`) } },
        `The mapping names columns the file does not have: ${missing.map((c) => `"${c}"`).join(', ')}.`,
      );
    }
    if (mapping.timeZone && !isTimeZone(mapping.timeZone)) {
      throw validationError({ fieldErrors: { 'mapping.timeZone': [`"${mapping.timeZone}" is not a time zone (use a name like America/Chicago)`] } });
    }
  }

  private async lockOrBusy(session: ImportSession): Promise<SessionLock> {
    const lock = await this.store.lock(session.farmId, session.importId);
    if (!lock) throw conflict('This import is being validated or committed right now; wait for it to finish.', { state: session.state }, 'import_busy');
    return lock;
  }

  /** Checks every row with the mapping; answers when done, or after a short wait with the running state. */
  async validate(farmId: string, importId: string, mapping: ImportMapping): Promise<ImportStatusView> {
    const session = await this.session(farmId, importId);
    this.checkMapping(session, mapping);
    const lock = await this.lockOrBusy(session);
    try {
      await this.store.clearRejects(farmId, importId);
      await this.store.update(farmId, importId, { state: 'validating', mapping, mappingKey: mappingKey(mapping), processedRows: 0, acceptedRows: 0, rejectedRows: 0, error: null });
    } catch (err) {
      await lock.release();
      throw err;
    }
    const task = this.track(this.runValidation({ ...session, mapping }, mapping, lock));
    let timer: NodeJS.Timeout | undefined;
    await Promise.race([task, new Promise((r) => (timer = setTimeout(r, this.validateWaitMs)))]);
    clearTimeout(timer);
    return this.status(farmId, importId, { offset: 0, limit: 100 });
  }

  /**
   * Starts the commit in the background and answers at once (state 'committing'). All good rows are
   * written in one transaction; rejected rows block it unless skipRejected is set.
   */
  async commit(farmId: string, importId: string, body: ImportCommitRequest, userId: string | null): Promise<ImportStatusView> {
    const session = await this.session(farmId, importId);
    this.checkMapping(session, body.mapping);
    const key = mappingKey(body.mapping);
    if (!body.skipRejected && session.state === 'validated' && session.mappingKey === key && session.rejectedRows > 0) {
      throw conflict(
        `${session.rejectedRows} row(s) are rejected. Fix the file and upload it again, or commit with skipRejected to store the other rows.`,
        { rejectedRows: session.rejectedRows },
        'rows_rejected',
      );
    }
    const lock = await this.lockOrBusy(session);
    const startedAt = new Date().toISOString();
    try {
      await this.store.clearRejects(farmId, importId);
      await this.store.clearWritten(farmId, importId);
      await this.store.update(farmId, importId, {
        state: 'committing',
        mapping: body.mapping,
        mappingKey: key,
        processedRows: 0,
        acceptedRows: 0,
        rejectedRows: 0,
        error: null,
        commit: { skipRejected: body.skipRejected, storedRows: 0, alreadyStoredRows: 0, skippedRows: 0, queuedResults: 0, startedAt, finishedAt: null },
      });
    } catch (err) {
      await lock.release();
      throw err;
    }
    void this.track(this.runCommit({ ...session, mapping: body.mapping }, body, userId, startedAt, lock));
    return this.status(farmId, importId, { offset: 0, limit: 100 });
  }

  /** Resolves when no validation or commit is running in this process (tests, shutdown). */
  async idle(): Promise<void> {
    while (this.running.size) await Promise.allSettled([...this.running]);
  }

  /** Background runs report their own failures in the session; nothing may escape as an unhandled rejection. */
  private track(task: Promise<void>): Promise<void> {
    const tracked = task.catch((err: unknown) => this.logger.error({ err }, 'import run failed')).finally(() => this.running.delete(tracked));
    this.running.add(tracked);
    return tracked;
  }

  private async checker(session: ImportSession, mapping: ImportMapping): Promise<RowChecker> {
    const farm = await this.repo.findFarm(session.farmId);
    if (!farm) throw notFound('Farm');
    return rowChecker({
      mapping,
      headers: session.headers,
      timeZone: farm.timeZone,
      decimalComma: session.delimiter !== ',',
      units: await this.repo.unitsOfFarm(session.farmId),
    });
  }

  /**
   * One pass over the file: every data row through the checker, progress and rejected rows written to
   * the session as it goes (every few hundred rows), `onGood` called for each good row.
   */
  private async pass(
    session: ImportSession,
    mapping: ImportMapping,
    lock: SessionLock,
    onGood: (row: { line: number; unitId: string; input: CreateWaterTest }) => Promise<void>,
  ): Promise<{ processed: number; accepted: number; rejected: number }> {
    const check = await this.checker(session, mapping);
    const { farmId, importId } = session;
    const path = this.filePath(importId);
    // The sweep removes files by age; a file whose import is in use is kept young.
    const now = new Date();
    await utimes(path, now, now).catch((err: NodeJS.ErrnoException) => {
      if (err.code === 'ENOENT') throw new AppError(410, 'import_expired', 'The uploaded file is no longer kept (imports expire 24 h after their last change). Upload the file again.');
      throw err;
    });
    const reader = readRows(path, session.delimiter);
    let processed = 0;
    let accepted = 0;
    let rejected = 0;
    let pending: ImportReject[] = [];
    let lastWrite = Date.now();
    let lastRefresh = Date.now();
    const flush = async () => {
      await this.store.appendRejects(farmId, importId, pending);
      pending = [];
      await this.store.update(farmId, importId, { processedRows: processed, acceptedRows: accepted, rejectedRows: rejected });
      lastWrite = Date.now();
      if (Date.now() - lastRefresh > LOCK_REFRESH_MS) {
        if (!(await lock.refresh())) throw new AppError(409, 'import_busy', 'The import lock was lost; run it again.');
        lastRefresh = Date.now();
      }
    };
    let first = true;
    for await (const row of reader.rows) {
      if (first) {
        first = false; // the header row
        continue;
      }
      processed++;
      const result = check(row.cells);
      if (result.ok) {
        accepted++;
        await onGood({ line: row.line, unitId: result.unitId, input: result.input });
      } else {
        rejected++;
        pending.push({ line: row.line, reasons: result.reasons });
      }
      if (processed % PROGRESS_EVERY_ROWS === 0 || Date.now() - lastWrite > PROGRESS_EVERY_MS) await flush();
    }
    await flush();
    return { processed, accepted, rejected };
  }

  private async runValidation(session: ImportSession, mapping: ImportMapping, lock: SessionLock): Promise<void> {
    const { farmId, importId } = session;
    try {
      const counts = await this.pass(session, mapping, lock, async () => undefined);
      await this.store.update(farmId, importId, { state: 'validated', processedRows: counts.processed, acceptedRows: counts.accepted, rejectedRows: counts.rejected });
    } catch (err) {
      await this.fail(session, err, 'validation');
    } finally {
      await lock.release();
    }
  }

  private async runCommit(session: ImportSession, body: ImportCommitRequest, userId: string | null, startedAt: string, lock: SessionLock): Promise<void> {
    const { farmId, importId } = session;
    const report = { skipRejected: body.skipRejected, storedRows: 0, alreadyStoredRows: 0, skippedRows: 0, queuedResults: 0, startedAt, finishedAt: null as string | null };
    const otherAnalyteUnits = new Set<string>();
    try {
      let counts = { processed: 0, accepted: 0, rejected: 0 };
      try {
        await this.repo.inTransaction(async (writer: ImportWriter) => {
          let batch: ImportedTestRow[] = [];
          const write = async () => {
            if (!batch.length) return;
            const written = await writer.insertTests(batch);
            report.storedRows += written.length;
            report.alreadyStoredRows += batch.length - written.length;
            await this.store.pushWritten(farmId, importId, written.filter((w) => w.analyte === 'total_ammonia').map((w) => w.id));
            for (const w of written) if (w.analyte !== 'total_ammonia') otherAnalyteUnits.add(w.unitId);
            batch = [];
          };
          counts = await this.pass(session, body.mapping, lock, async (good) => {
            batch.push(toRow(farmId, good.unitId, { ...good.input, clientId: clientIdFor(importId, good.line, good.input.analyte) }, userId));
            if (batch.length >= this.batchSize) await write();
          });
          await write();
          if (counts.rejected > 0 && !body.skipRejected) throw new RejectedRowsFound();
        });
      } catch (err) {
        if (!(err instanceof RejectedRowsFound)) throw err;
        await this.store.clearWritten(farmId, importId);
        await this.store.update(farmId, importId, {
          state: 'validated',
          processedRows: counts.processed,
          acceptedRows: counts.accepted,
          rejectedRows: counts.rejected,
          commit: null,
          error: {
            code: 'rows_rejected',
            message: `Nothing was stored: ${counts.rejected} row(s) are rejected. Fix the file and upload it again, or commit with skipRejected to store the other rows.`,
          },
        });
        return;
      }
      report.skippedRows = counts.rejected;
      // The transaction is committed: now queue the free-ammonia computation of every new total-ammonia test.
      report.queuedResults = await this.queueResults(farmId, importId);
      for (const unitId of otherAnalyteUnits) {
        await this.queues.add('evaluateUnit', { farmId, unitId, reason: 'import' }, { deduplication: { id: `unit:${unitId}`, keepLastIfActive: true } });
      }
      report.finishedAt = new Date().toISOString();
      await this.audit.record({
        farmId,
        actorId: userId,
        action: 'water_tests.imported',
        entity: 'import',
        entityId: importId,
        before: null,
        after: { fileName: session.fileName, sha256: session.sha256, mapping: body.mapping, ...report },
      });
      await this.store.update(farmId, importId, {
        state: 'committed',
        processedRows: counts.processed,
        acceptedRows: counts.accepted,
        rejectedRows: counts.rejected,
        commit: report,
        error: null,
      });
    } catch (err) {
      await this.store.clearWritten(farmId, importId).catch(() => undefined);
      await this.fail(session, err, 'commit', { commit: null });
    } finally {
      await lock.release();
    }
  }

  private async queueResults(farmId: string, importId: string): Promise<number> {
    const def = jobs.computeWaterTest;
    const queue = this.queues.queue(def.queue);
    let queued = 0;
    for (;;) {
      const ids = await this.store.takeWritten(farmId, importId, QUEUE_CHUNK);
      if (!ids.length) return queued;
      // Same job id as a test entered at the pondside: a test is computed once per version.
      await queue.addBulk(
        ids.map((id) => ({ name: def.name, data: def.payload.parse({ farmId, waterTestId: id, version: 1 }), opts: { jobId: `wt-${id}-1` } })),
      );
      queued += ids.length;
    }
  }

  private async fail(session: ImportSession, err: unknown, what: string, extra: Partial<ImportSession> = {}): Promise<void> {
    const error =
      err instanceof AppError
        ? { code: err.code, message: err.message }
        : { code: 'internal', message: `The ${what} failed on the server and nothing was stored. The error was logged; try again.` };
    if (!(err instanceof AppError)) this.logger.error({ err, importId: session.importId }, `import ${what} failed`);
    await this.store.update(session.farmId, session.importId, { state: 'failed', error, ...extra }).catch((e: unknown) => this.logger.error({ err: e }, 'import state write failed'));
  }
}

function toRow(farmId: string, unitId: string, input: CreateWaterTest, userId: string | null): ImportedTestRow {
  return {
    farmId,
    unitId,
    clientId: input.clientId,
    analyte: input.analyte,
    method: input.method,
    basis: input.basis,
    value: input.value,
    unit: analyteRules[input.analyte].unit,
    sampledAt: input.sampledAt ?? new Date().toISOString(),
    handheldPh: input.handheldPh ?? null,
    handheldTemperatureC: input.handheldTemperatureC ?? null,
    handheldSalinityPpt: input.handheldSalinityPpt ?? null,
    note: input.note ?? null,
    enteredById: userId,
  };
}
