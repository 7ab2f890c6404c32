import type { ImportStatus, ImportUploadResponse } from '../../../shared/schemas/imports.schema';
import { SESSION_TTL_SECONDS, type ImportSession } from './import-sessions.store';
import type { ImportStatusView, UploadResult } from './imports.service';

/** Preview cells are for recognising columns; a long note is cut so 20 rows stay a small response. */
const PREVIEW_CELL_CHARS = 300;
const previewCell = (c: string) => (c.length > PREVIEW_CELL_CHARS ? `${c.slice(0, PREVIEW_CELL_CHARS)}…` : c);

const expiresAt = (s: ImportSession) => new Date(Date.parse(s.updatedAt) + SESSION_TTL_SECONDS * 1000).toISOString();

export function presentUpload(r: UploadResult): ImportUploadResponse {
  const s = r.session;
  return {
    importId: s.importId,
    farmId: s.farmId,
    fileName: s.fileName,
    sizeBytes: s.sizeBytes,
    delimiter: s.delimiter,
    headers: s.headers,
    totalRows: s.totalRows,
    preview: r.preview.map((row) => ({ line: row.line, cells: row.cells.map(previewCell) })),
    suggestedMapping: r.suggestion,
    warnings: r.warnings,
    state: s.state,
    existing: r.existing,
    expiresAt: new Date(Date.now() + SESSION_TTL_SECONDS * 1000).toISOString(),
  };
}

export function presentStatus(v: ImportStatusView): ImportStatus {
  const s = v.session;
  return {
    importId: s.importId,
    farmId: s.farmId,
    fileName: s.fileName,
    sizeBytes: s.sizeBytes,
    headers: s.headers,
    state: s.state,
    totalRows: s.totalRows,
    processedRows: s.processedRows,
    acceptedRows: s.acceptedRows,
    rejectedRows: s.rejectedRows,
    mapping: s.mapping,
    rejects: v.rejects,
    rejectsPage: v.page,
    commit: s.commit
      ? {
          skipRejected: s.commit.skipRejected,
          storedRows: s.commit.storedRows,
          alreadyStoredRows: s.commit.alreadyStoredRows,
          skippedRows: s.commit.skippedRows,
          queuedResults: s.commit.queuedResults,
          startedAt: s.commit.startedAt,
          finishedAt: s.commit.finishedAt,
        }
      : null,
    error: s.error ? { code: s.error.code, message: s.error.message } : null,
    createdAt: s.createdAt,
    updatedAt: s.updatedAt,
    expiresAt: expiresAt(s),
  };
}
