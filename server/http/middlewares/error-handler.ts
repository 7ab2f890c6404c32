import type { NextFunction, Request, Response } from 'express';
import type { Logger } from '../../lib/logger';
import { AppError } from '../errors';
import { ChemistryInputError } from '../../../shared/chemistry';

type BodyParserError = Error & { type?: string; status?: number; expose?: boolean };

/** The one place errors become responses; unknown errors are logged and answered 500 without internals. */
export function errorHandler(logger: Logger) {
  return (err: unknown, req: Request, res: Response, _next: NextFunction): void => {
    const send = (status: number, code: string, message: string, details?: unknown) => {
      if (res.headersSent) return;
      res.status(status).json({ error: { code, message, ...(details === undefined ? {} : { details }) } });
    };
    if (err instanceof AppError) return send(err.status, err.code, err.message, err.details);
    if (err instanceof ChemistryInputError) {
      return send(422, 'out_of_range', err.message, { field: err.field, min: err.min, max: err.max });
    }
    const e = err as BodyParserError;
    if (e && typeof e === 'object' && typeof e.type === 'string') {
      if (e.type === 'entity.too.large') return send(413, 'payload_too_large', 'The request body is too large.');
      if (e.type === 'entity.parse.failed') return send(400, 'malformed_json', 'The request body is not valid JSON.');
      if (e.type === 'encoding.unsupported' || e.type === 'charset.unsupported')
        return send(415, 'unsupported_media_type', 'Unsupported body encoding.');
      if (e.expose && e.status && e.status < 500) return send(e.status, 'bad_request', 'The request could not be read.');
    }
    if (e && typeof e === 'object' && (e as { code?: string }).code === 'LIMIT_FILE_SIZE') {
      return send(413, 'payload_too_large', 'The file is larger than allowed.');
    }
    logger.error({ err, requestId: res.locals.requestId, path: req.path }, 'unhandled error');
    send(500, 'internal', 'Something went wrong on the server. The error was logged.');
  };
}
