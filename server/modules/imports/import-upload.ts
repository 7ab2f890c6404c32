import { randomUUID } from 'node:crypto';
import { mkdir, rm } from 'node:fs/promises';
import { extname } from 'node:path';
import type { NextFunction, Request, Response } from 'express';
import multer from 'multer';
import { importLimits } from '../../../shared/schemas/imports.schema';
import type { Role } from '../../../shared/schemas/auth.schema';
import { roleOnFarm } from '../../http/auth-context';
import { SESSION_COOKIE, type Authenticator } from '../../http/build-router';
import { AppError, badRequest, payloadTooLarge } from '../../http/errors';

// The multipart part of POST …/imports. Multer runs before the registry's handler, so this middleware
// first checks that the caller may upload to the farm — nobody else gets bytes written to disk — and
// stores the file under a random server-side name (the client's file name is only ever displayed).

const TEXT_TYPES = new Set(['text/csv', 'text/plain', 'application/csv', 'text/comma-separated-values', 'text/tab-separated-values', 'text/x-csv']);
const TEXT_EXTENSIONS = new Set(['.csv', '.txt', '.tsv']);

export type UploadedFile = { path: string; originalname: string; size: number; mimetype: string };

function tokenOf(req: Request): string | null {
  const header = req.header('authorization');
  if (header?.startsWith('Bearer ')) return header.slice(7).trim() || null;
  const cookies = (req as Request & { cookies?: Record<string, string> }).cookies;
  return cookies?.[SESSION_COOKIE] ?? null;
}

function typeProblem(file: { originalname: string; mimetype: string }): AppError | null {
  const ext = extname(file.originalname).toLowerCase();
  if (ext === '.xlsx' || ext === '.xls' || ext === '.ods') {
    return new AppError(415, 'spreadsheet_not_csv', `"${file.originalname}" is a spreadsheet workbook, not CSV. In the spreadsheet use Save As › "CSV UTF-8" and upload that file.`);
  }
  if (TEXT_EXTENSIONS.has(ext) || TEXT_TYPES.has(file.mimetype.toLowerCase())) return null;
  return new AppError(415, 'unsupported_media_type', `Upload a .csv file (got "${file.originalname}", ${file.mimetype || 'no type'}).`);
}

function translate(err: unknown): unknown {
  if (err instanceof AppError) return err;
  if (err instanceof multer.MulterError) {
    if (err.code === 'LIMIT_FILE_SIZE') return payloadTooLarge(`The file is larger than ${importLimits.maxBytes / 1024 / 1024} MB. Split it into smaller files.`);
    if (err.code === 'LIMIT_UNEXPECTED_FILE') return badRequest(`Send the CSV as the form field "file"${err.field ? ` (got "${err.field}")` : ''}, one file per upload.`, undefined, 'file_field');
    return badRequest(`The upload could not be read (${err.message}).`, undefined, 'upload_malformed');
  }
  return badRequest('The upload was cut off or is not valid multipart form data.', undefined, 'upload_malformed');
}

/** `before` middleware for the upload route: authorise, then multer (disk storage, 20 MB, one file). */
export function importUpload(opts: { auth: Pick<Authenticator, 'authenticate'>; roles: readonly Role[]; dir: string }) {
  const upload = multer({
    storage: multer.diskStorage({
      destination: (_req, _file, cb) => {
        mkdir(opts.dir, { recursive: true }).then(
          () => cb(null, opts.dir),
          (err: Error) => cb(err, opts.dir),
        );
      },
      filename: (_req, _file, cb) => cb(null, `${randomUUID()}.part`),
    }),
    limits: { fileSize: importLimits.maxBytes, files: 1, fields: 10, parts: 12, fieldSize: 64 * 1024 },
    fileFilter: (_req, file, cb) => {
      const problem = typeProblem(file);
      if (problem) cb(problem);
      else cb(null, true);
    },
  }).single('file');

  const mayUpload = async (req: Request): Promise<boolean> => {
    const token = tokenOf(req);
    const farmId = req.params.farmId;
    if (!token || typeof farmId !== 'string') return false;
    const user = await opts.auth.authenticate(token).catch(() => null);
    const role = user ? roleOnFarm(user, farmId) : null;
    return role !== null && opts.roles.includes(role);
  };

  return (req: Request, res: Response, next: NextFunction): void => {
    mayUpload(req).then(
      (allowed) => {
        // Not allowed: skip multer; the registry's handler answers 401, 403 or 404 as for any route.
        if (!allowed) return next();
        res.on('close', () => {
          const file = (req as Request & { file?: UploadedFile }).file;
          if (file) void rm(file.path, { force: true }).catch(() => undefined);
        });
        upload(req, res, (err?: unknown) => next(err ? translate(err) : undefined));
      },
      (err: unknown) => next(err),
    );
  };
}
