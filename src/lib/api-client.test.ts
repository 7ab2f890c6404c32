import { afterEach, describe, expect, it, vi } from 'vitest';
import { api, ApiError, onUnauthorized } from './api-client';

function stubFetch(status: number, body?: unknown) {
  const fetchMock = vi.fn(async () => new Response(body === undefined ? null : JSON.stringify(body), {
    status,
    headers: body === undefined ? {} : { 'content-type': 'application/json' },
  }));
  vi.stubGlobal('fetch', fetchMock);
  return fetchMock;
}

afterEach(() => vi.unstubAllGlobals());

describe('api client', () => {
  it('sends JSON with same-origin credentials and the client header', async () => {
    const fetchMock = stubFetch(200, { ok: true });
    await expect(api.post('/api/x', { a: 1 })).resolves.toEqual({ ok: true });
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/x');
    expect(init.credentials).toBe('same-origin');
    expect(init.body).toBe('{"a":1}');
    expect(init.headers).toMatchObject({ 'x-gillwise-client': 'web', 'content-type': 'application/json' });
  });

  it('returns undefined for 204', async () => {
    stubFetch(204);
    await expect(api.post('/api/auth/logout')).resolves.toBeUndefined();
  });

  it('turns the error shape into an ApiError with status, code, message, details and field errors', async () => {
    stubFetch(400, { error: { code: 'validation_failed', message: 'Bad body', details: { fieldErrors: { email: ['Taken'] } } } });
    const error = await api.post('/api/x', {}).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 400, code: 'validation_failed', message: 'Bad body' });
    expect((error as ApiError).fieldErrors).toEqual({ email: ['Taken'] });
  });

  it('makes up a code when the body is not the error shape', async () => {
    stubFetch(502, 'Bad gateway');
    await expect(api.get('/api/x')).rejects.toMatchObject({ status: 502, code: 'http_502' });
  });

  it('reports a network failure as status 0, code "network"', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => { throw new TypeError('Failed to fetch'); }));
    await expect(api.get('/api/x')).rejects.toMatchObject({ status: 0, code: 'network' });
  });

  it('calls the unauthorized handler on 401 unless the request opts out', async () => {
    const handler = vi.fn();
    const off = onUnauthorized(handler);
    stubFetch(401, { error: { code: 'unauthenticated', message: 'Sign in' } });
    await api.get('/api/units').catch(() => undefined);
    expect(handler).toHaveBeenCalledTimes(1);
    await api.post('/api/auth/login', {}, { skipAuthRedirect: true }).catch(() => undefined);
    expect(handler).toHaveBeenCalledTimes(1);
    off();
  });
});
