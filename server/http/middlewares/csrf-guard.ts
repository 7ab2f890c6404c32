import type { NextFunction, Request, Response } from 'express';
import { CLIENT_HEADER } from '../../../shared/schemas/auth.schema';
import { AppError } from '../errors';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Cross-site request guard for cookie sessions. A state-changing request must carry a JSON content type
 * or our client header — neither can be sent cross-site without a CORS preflight, which we never grant —
 * and, when the browser sends an Origin, it must be our own. Non-browser clients send no Origin: allowed.
 */
export function csrfGuard(allowedOrigins: string[]) {
  return (req: Request, _res: Response, next: NextFunction): void => {
    if (SAFE.has(req.method)) return next();
    const origin = req.header('origin');
    if (origin && !allowedOrigins.includes(origin) && origin !== `${req.protocol}://${req.header('host') ?? ''}`) {
      return next(new AppError(403, 'cross_site_refused', 'Cross-site request refused.'));
    }
    const contentType = req.header('content-type') ?? '';
    const hasBody = req.header('content-length') !== undefined && req.header('content-length') !== '0';
    const jsonBody = contentType.toLowerCase().startsWith('application/json');
    if (req.header(CLIENT_HEADER) || jsonBody || (!hasBody && !req.header('transfer-encoding') && !contentType)) {
      // A bodiless request still needs the header when it comes from a browser (it has an Origin).
      if (!req.header(CLIENT_HEADER) && !jsonBody && origin) {
        return next(new AppError(403, 'cross_site_refused', `Send the ${CLIENT_HEADER} header with this request.`));
      }
      return next();
    }
    next(new AppError(415, 'unsupported_media_type', `Send JSON, or the ${CLIENT_HEADER} header with uploads.`));
  };
}
