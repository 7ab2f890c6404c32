import { apiErrorSchema, CLIENT_HEADER } from '@shared/schemas/auth.schema';
import type { z } from 'zod';
import { env } from '@/config/env';

export type FieldErrors = Record<string, string[]>;

/** An answer from the API that was not 2xx, or no answer at all (status 0, code 'network'). */
export class ApiError extends Error {
  override readonly name = 'ApiError';
  readonly status: number;
  readonly code: string;
  readonly details: unknown;

  constructor(init: { status: number; code: string; message: string; details?: unknown }) {
    super(init.message);
    this.status = init.status;
    this.code = init.code;
    this.details = init.details;
  }

  /** `details.fieldErrors` when the server sent them (validation failures), else {}. */
  get fieldErrors(): FieldErrors {
    const d = this.details;
    if (d && typeof d === 'object' && 'fieldErrors' in d) {
      const fe = (d as { fieldErrors: unknown }).fieldErrors;
      if (fe && typeof fe === 'object') {
        const out: FieldErrors = {};
        for (const [field, messages] of Object.entries(fe as Record<string, unknown>)) {
          if (Array.isArray(messages)) out[field] = messages.filter((m): m is string => typeof m === 'string');
        }
        return out;
      }
    }
    return {};
  }
}

export function isApiError(e: unknown): e is ApiError {
  return e instanceof ApiError;
}

type UnauthorizedHandler = (error: ApiError) => void;
let unauthorizedHandler: UnauthorizedHandler | null = null;

/**
 * Called on every 401 (except requests made with `skipAuthRedirect`). The auth provider registers a
 * handler that clears the signed-in user; the route guard then sends the browser to /sign-in?next=….
 */
export function onUnauthorized(handler: UnauthorizedHandler | null): () => void {
  unauthorizedHandler = handler;
  return () => {
    if (unauthorizedHandler === handler) unauthorizedHandler = null;
  };
}

export interface RequestOptions<T> {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  body?: unknown;
  /** Validate the response body with this schema (recommended for every read). */
  schema?: z.ZodType<T>;
  signal?: AbortSignal;
  query?: Record<string, string | number | boolean | undefined | null>;
  /** A 401 here is an ordinary answer (sign-in form, GET /api/me), not "session expired". */
  skipAuthRedirect?: boolean;
  headers?: Record<string, string>;
}

export function apiUrl(path: string, query?: RequestOptions<unknown>['query']): string {
  let url = `${env.VITE_API_BASE_URL}${path}`;
  if (query) {
    const params = new URLSearchParams();
    for (const [k, v] of Object.entries(query)) if (v !== undefined && v !== null) params.set(k, String(v));
    const qs = params.toString();
    if (qs) url += (url.includes('?') ? '&' : '?') + qs;
  }
  return url;
}

async function readBody(response: Response): Promise<unknown> {
  if (response.status === 204 || response.status === 205) return undefined;
  const text = await response.text();
  if (!text) return undefined;
  const type = response.headers.get('content-type') ?? '';
  if (type.includes('json')) {
    try {
      return JSON.parse(text);
    } catch {
      return text;
    }
  }
  return text;
}

/** The one fetch wrapper: same-origin cookies, JSON both ways, the client header on every request. */
export async function apiRequest<T = unknown>(path: string, options: RequestOptions<T> = {}): Promise<T> {
  const { method = 'GET', body, schema, signal, query, skipAuthRedirect, headers } = options;
  const init: RequestInit = {
    method,
    credentials: 'same-origin',
    headers: { accept: 'application/json', [CLIENT_HEADER]: 'web', ...headers },
    signal,
  };
  if (body !== undefined) {
    (init.headers as Record<string, string>)['content-type'] = 'application/json';
    init.body = JSON.stringify(body);
  }

  let response: Response;
  try {
    response = await fetch(apiUrl(path, query), init);
  } catch (cause) {
    if (signal?.aborted) throw cause;
    throw new ApiError({ status: 0, code: 'network', message: 'The server could not be reached.' });
  }

  const data = await readBody(response);
  if (!response.ok) {
    const parsed = apiErrorSchema.safeParse(data);
    const error = parsed.success
      ? new ApiError({ status: response.status, ...parsed.data.error })
      : new ApiError({
          status: response.status,
          code: response.status === 429 ? 'rate_limited' : `http_${response.status}`,
          message: response.statusText || `Request failed with status ${response.status}`,
        });
    if (response.status === 401 && !skipAuthRedirect) unauthorizedHandler?.(error);
    throw error;
  }
  return (schema ? schema.parse(data) : data) as T;
}

export const api = {
  get: <T>(path: string, o?: Omit<RequestOptions<T>, 'method' | 'body'>) => apiRequest<T>(path, { ...o, method: 'GET' }),
  post: <T = void>(path: string, body?: unknown, o?: Omit<RequestOptions<T>, 'method' | 'body'>) =>
    apiRequest<T>(path, { ...o, method: 'POST', body }),
  put: <T = void>(path: string, body?: unknown, o?: Omit<RequestOptions<T>, 'method' | 'body'>) =>
    apiRequest<T>(path, { ...o, method: 'PUT', body }),
  patch: <T = void>(path: string, body?: unknown, o?: Omit<RequestOptions<T>, 'method' | 'body'>) =>
    apiRequest<T>(path, { ...o, method: 'PATCH', body }),
  delete: <T = void>(path: string, o?: Omit<RequestOptions<T>, 'method' | 'body'>) =>
    apiRequest<T>(path, { ...o, method: 'DELETE' }),
};
