import { z } from 'zod';
import { analytes, testBases, testMethods } from './water-tests.schema';

// CSV import of kit results, lab results and handheld meter logs. The rows themselves are checked with
// createWaterTestSchema (water-tests.schema.ts), the same schema as the pondside form and the API.

export const importStates = ['uploaded', 'validating', 'validated', 'committing', 'committed', 'failed'] as const;
export type ImportState = (typeof importStates)[number];

/** Limits of one upload (docs/imports.md). */
export const importLimits = { maxBytes: 20 * 1024 * 1024, maxRows: 200_000, maxColumns: 200, previewRows: 20 } as const;

const columnName = z.string().min(1).max(200);

/** A field read from a file column, or one value for every row (e.g. all rows are salicylate kits). */
const columnOr = <T extends z.ZodType>(fixed: T) => z.union([z.object({ column: columnName }), z.object({ fixed })]);

export const dateOrders = ['ymd', 'dmy', 'mdy'] as const;
export const temperatureUnits = ['c', 'f'] as const;

/**
 * Which file column feeds which field. Column names are the file's header names exactly as returned by
 * the upload (duplicate or blank headers are renamed there). Times without an offset are wall-clock
 * times in `timeZone` (default: the farm's time zone).
 */
export const importMappingSchema = z.object({
  unitCode: columnName,
  sampledAt: z.union([z.object({ column: columnName }), z.object({ dateColumn: columnName, timeColumn: columnName })]),
  /** How to read dates written with slashes or dots (03/04/2025): year-month-day, day-month-year, month-day-year. */
  dateOrder: z.enum(dateOrders).default('ymd'),
  timeZone: z.string().min(1).max(64).optional(),
  analyte: columnOr(z.enum(analytes)),
  method: columnOr(z.enum(testMethods)),
  basis: columnOr(z.enum(testBases)),
  value: columnName,
  handheldPh: columnName.nullish(),
  handheldTemperature: z.object({ column: columnName, unit: z.enum(temperatureUnits) }).nullish(),
  handheldSalinityPpt: columnName.nullish(),
  note: columnName.nullish(),
});
export type ImportMapping = z.infer<typeof importMappingSchema>;
export type ImportMappingInput = z.input<typeof importMappingSchema>;

/**
 * The server's guess from the header names and the first rows. A field is null when no column looks
 * like it; `basis` is never guessed from a bare "NH3" header (as N or as NH3 changes the result by 22 %).
 */
export const suggestedMappingSchema = z.object({
  unitCode: columnName.nullable(),
  sampledAt: z.union([z.object({ column: columnName }), z.object({ dateColumn: columnName, timeColumn: columnName })]).nullable(),
  dateOrder: z.enum(dateOrders),
  timeZone: z.string(),
  analyte: columnOr(z.enum(analytes)).nullable(),
  method: columnOr(z.enum(testMethods)).nullable(),
  basis: columnOr(z.enum(testBases)).nullable(),
  value: columnName.nullable(),
  handheldPh: columnName.nullable(),
  handheldTemperature: z.object({ column: columnName, unit: z.enum(temperatureUnits) }).nullable(),
  handheldSalinityPpt: columnName.nullable(),
  note: columnName.nullable(),
});
export type SuggestedMapping = z.infer<typeof suggestedMappingSchema>;

/** JSON alternative to the multipart upload, for pasted text (up to the 1 MB JSON body limit). */
export const importUploadJsonSchema = z.object({
  fileName: z.string().min(1).max(255).optional(),
  csv: z.string().min(1).optional(),
});

export const importWarningSchema = z.object({ code: z.string(), message: z.string() });
export type ImportWarning = z.infer<typeof importWarningSchema>;

export const importPreviewRowSchema = z.object({
  /** Line in the file where the row starts (the header is line 1; a quoted cell may span lines). */
  line: z.number().int().positive(),
  /** Cells in file order (a row may have fewer or more cells than the header); cells over 300 characters are cut with "…". */
  cells: z.array(z.string()),
});

export const importUploadResponseSchema = z.object({
  importId: z.uuid(),
  farmId: z.uuid(),
  /** The client's file name, for display only (never used as a path). */
  fileName: z.string(),
  sizeBytes: z.number().int(),
  delimiter: z.enum([',', ';', '\t', '|']),
  headers: z.array(z.string()),
  totalRows: z.number().int(),
  preview: z.array(importPreviewRowSchema),
  suggestedMapping: suggestedMappingSchema,
  warnings: z.array(importWarningSchema),
  state: z.enum(importStates),
  /** True when the same file was already uploaded to this farm: the existing import is returned. */
  existing: z.boolean(),
  expiresAt: z.string(),
});
export type ImportUploadResponse = z.infer<typeof importUploadResponseSchema>;

export const importRejectSchema = z.object({
  line: z.number().int().positive(),
  reasons: z.array(z.string()).min(1),
});
export type ImportReject = z.infer<typeof importRejectSchema>;

export const importValidateRequestSchema = z.object({ mapping: importMappingSchema });
export const importCommitRequestSchema = z.object({
  mapping: importMappingSchema,
  /** Store the good rows and skip the rejected ones (each listed in the report). Default: refuse while any row is rejected. */
  skipRejected: z.boolean().default(false),
});
export type ImportCommitRequest = z.infer<typeof importCommitRequestSchema>;

export const importStatusQuerySchema = z.object({
  rejectsOffset: z.coerce.number().int().min(0).default(0),
  rejectsLimit: z.coerce.number().int().min(1).max(1000).default(100),
});
export type ImportStatusQuery = z.infer<typeof importStatusQuerySchema>;

export const importStatusSchema = z.object({
  importId: z.uuid(),
  farmId: z.uuid(),
  fileName: z.string(),
  sizeBytes: z.number().int(),
  headers: z.array(z.string()),
  state: z.enum(importStates),
  totalRows: z.number().int(),
  /** Rows checked so far by the running validation or commit (increases while it runs). */
  processedRows: z.number().int(),
  acceptedRows: z.number().int(),
  rejectedRows: z.number().int(),
  /** The mapping of the last validation or commit. */
  mapping: importMappingSchema.nullable(),
  rejects: z.array(importRejectSchema),
  rejectsPage: z.object({ offset: z.number().int(), limit: z.number().int(), total: z.number().int() }),
  commit: z
    .object({
      skipRejected: z.boolean(),
      /** Rows written by this commit. */
      storedRows: z.number().int(),
      /** Rows whose client id was already stored (a re-run of the same import): not written twice. */
      alreadyStoredRows: z.number().int(),
      /** Rejected rows left out because skipRejected was set; every one is in `rejects`. */
      skippedRows: z.number().int(),
      /** Total-ammonia tests queued for the free-ammonia computation. */
      queuedResults: z.number().int(),
      startedAt: z.string(),
      finishedAt: z.string().nullable(),
    })
    .nullable(),
  error: z.object({ code: z.string(), message: z.string() }).nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
  expiresAt: z.string(),
});
export type ImportStatus = z.infer<typeof importStatusSchema>;
