/** The one error model of the API: every failure leaves the server as `{ error: { code, message, details } }`. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const badRequest = (message: string, details?: unknown, code = 'bad_request') => new AppError(400, code, message, details);
export const validationError = (details: unknown, message = 'Some fields are not valid.') =>
  new AppError(400, 'validation_failed', message, details);
export const unauthorized = (message = 'Sign in to continue.', code = 'unauthorized') => new AppError(401, code, message);
export const forbidden = (message = 'Your role does not allow this.') => new AppError(403, 'forbidden', message);
export const notFound = (what = 'Resource') => new AppError(404, 'not_found', `${what} not found.`);
export const conflict = (message: string, details?: unknown, code = 'conflict') => new AppError(409, code, message, details);
export const unprocessable = (message: string, details?: unknown, code = 'unprocessable') => new AppError(422, code, message, details);
export const tooManyRequests = (message = 'Too many attempts. Wait a few minutes and try again.') =>
  new AppError(429, 'rate_limited', message);
export const payloadTooLarge = (message = 'The upload is too large.') => new AppError(413, 'payload_too_large', message);
export const unsupportedMediaType = (message: string) => new AppError(415, 'unsupported_media_type', message);
export const serviceUnavailable = (message: string) => new AppError(503, 'unavailable', message);
