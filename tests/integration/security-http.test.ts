// The session cookie's attributes, the cross-site request guard walked over every state-changing
// route of the registry, and uploads: size and type limits, file names never used as paths, and
// nothing read from a caller the route refuses.
import { existsSync, mkdirSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RouteDef, RouteFixture } from '../../server/http/route-registry';
import { DEMO_PASSWORD, demoEmail } from '../factories/demo';
import { buildRouteFixture, FIXTURE_PHOTO } from '../factories/route-fixture';
import { startTestApp, type TestApp } from '../setup/test-app';

const TINY_PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==', 'base64');
const FOREIGN = 'http://evil.example';

let t: TestApp;
let fixture: RouteFixture;

beforeAll(async () => {
  t = await startTestApp();
  fixture = await buildRouteFixture(t.ds);
  mkdirSync(join(t.config.DATA_DIR, 'photos'), { recursive: true });
  writeFileSync(join(t.config.DATA_DIR, 'photos', FIXTURE_PHOTO), TINY_PNG);
}, 120_000);
afterAll(() => t.close());

const login = (app = t.app, email = demoEmail('manager')) =>
  request(app).post('/api/auth/login').set('content-type', 'application/json').send({ email, password: DEMO_PASSWORD });
const sessionCookie = (res: request.Response) => (res.headers['set-cookie'] as unknown as string[] | undefined)?.find((c) => c.startsWith('gw_session=')) ?? '';
async function cookieFor(email = demoEmail('manager')): Promise<string> {
  return sessionCookie(await login(t.app, email)).split(';')[0]!;
}
const fill = (path: string, params: Record<string, string>) => path.replace(/:([A-Za-z]+)/g, (_m, n: string) => encodeURIComponent(params[n] ?? 'x'));

describe('the session cookie', () => {
  it('is httpOnly, SameSite=Lax, for the whole site, as long-lived as the token, and not Secure on plain http', async () => {
    const cookie = sessionCookie(await login());
    const attrs = cookie.split(';').map((a) => a.trim().toLowerCase());
    expect(attrs).toContain('httponly');
    expect(attrs).toContain('samesite=lax');
    expect(attrs).toContain('path=/');
    expect(attrs).toContain(`max-age=${t.config.JWT_TTL_SECONDS}`);
    expect(attrs).not.toContain('secure');
    expect(attrs.some((a) => a.startsWith('domain='))).toBe(false);
  });

  it('is Secure when the public URL is https, and cleared with the same attributes on sign-out', async () => {
    const secure = await startTestApp({ env: { PUBLIC_URL: 'https://farm.example' } });
    try {
      const { seedDemoFarms } = await import('../factories/demo');
      await seedDemoFarms(secure.ds);
      const cookie = sessionCookie(await login(secure.app));
      expect(cookie.split(';').map((a) => a.trim().toLowerCase())).toEqual(expect.arrayContaining(['httponly', 'samesite=lax', 'secure']));
      const out = await request(secure.app).post('/api/auth/logout').set('x-gillwise-client', 'web').set('cookie', cookie.split(';')[0]!);
      const cleared = sessionCookie(out).split(';').map((a) => a.trim().toLowerCase());
      expect(cleared[0]).toBe('gw_session=');
      expect(cleared).toEqual(expect.arrayContaining(['httponly', 'samesite=lax', 'secure', 'path=/']));
      expect(cleared.some((a) => a.startsWith('expires=thu, 01 jan 1970'))).toBe(true);
    } finally {
      await secure.close();
    }
  });
});

describe('cross-site requests', () => {
  const stateChanging = () => t.routes.filter((r) => r.method !== 'get' && r.access.kind !== 'public');

  it('refuses every state-changing route from a foreign Origin, even with a valid session cookie and JSON', async () => {
    const cookie = await cookieFor(demoEmail('admin'));
    const wrong: string[] = [];
    for (const route of stateChanging()) {
      const example = route.example?.(fixture) ?? {};
      const res = await request(t.app)
        [route.method](fill(route.path, example.params ?? {}))
        .set('cookie', cookie)
        .set('origin', FOREIGN)
        .set('content-type', 'application/json')
        .send(JSON.stringify(example.body ?? {}));
      if (res.status !== 403 || res.body?.error?.code !== 'cross_site_refused') wrong.push(`${route.method.toUpperCase()} ${route.path} → ${res.status}`);
    }
    expect(wrong).toEqual([]);
  });

  it('refuses the requests a cross-site page can send without a preflight: form, text and multipart bodies, and bodiless posts', async () => {
    const cookie = await cookieFor(demoEmail('admin'));
    const wrong: string[] = [];
    for (const route of stateChanging()) {
      const url = fill(route.path, route.example?.(fixture).params ?? {});
      const form = await request(t.app)[route.method](url).set('cookie', cookie).type('form').send('a=1');
      const text = await request(t.app)[route.method](url).set('cookie', cookie).set('content-type', 'text/plain').send('{"a":1}');
      const multipart = await request(t.app)[route.method](url).set('cookie', cookie).attach('file', Buffer.from('x'), 'x.csv');
      // A browser sends its Origin with a cross-site POST; here the Origin is our own, but the client header is missing.
      const bodiless = await request(t.app)[route.method](url).set('cookie', cookie).set('origin', t.config.PUBLIC_URL);
      for (const [kind, res, want] of [
        ['form', form, 415],
        ['text/plain', text, 415],
        ['multipart', multipart, 415],
        ['bodiless with Origin', bodiless, 403],
      ] as const) {
        if (res.status !== want) wrong.push(`${kind} ${route.method.toUpperCase()} ${route.path} → ${res.status} (want ${want})`);
      }
    }
    expect(wrong).toEqual([]);
  });

  it('grants no CORS: no Access-Control-Allow-Origin for a foreign origin, on answers or preflights', async () => {
    const cookie = await cookieFor();
    const get = await request(t.app).get('/api/me').set('origin', FOREIGN).set('cookie', cookie);
    const preflight = await request(t.app)
      .options('/api/auth/login')
      .set('origin', FOREIGN)
      .set('access-control-request-method', 'POST')
      .set('access-control-request-headers', 'content-type,x-gillwise-client');
    for (const res of [get, preflight]) {
      expect(res.headers['access-control-allow-origin']).toBeUndefined();
      expect(res.headers['access-control-allow-credentials']).toBeUndefined();
    }
  });
});

describe('uploads', () => {
  const importsRoute = () => t.routes.find((r) => r.method === 'post' && r.path === '/api/farms/:farmId/imports');
  const photoRoute = () => t.routes.find((r: RouteDef) => r.method === 'post' && /\/photo$/.test(r.path));
  const listFiles = () => (existsSync(t.config.DATA_DIR) ? (readdirSync(t.config.DATA_DIR, { recursive: true }) as string[]) : []);

  it('imports: refuses over 20 MB (413), workbooks and non-text (415), and keeps the file under a server-made name', async () => {
    const route = importsRoute();
    if (!route) return console.log('[security] uploads: no imports route in the registry; skipped');
    const cookie = await cookieFor();
    const url = fill(route.path, { farmId: fixture.farmId! });
    const post = () => request(t.app).post(url).set('cookie', cookie).set('x-gillwise-client', 'web');
    const big = await post().attach('file', Buffer.alloc(21 * 1024 * 1024, 0x61), 'big.csv');
    expect(big.status).toBe(413);
    expect(big.body.error.code).toBe('payload_too_large');
    expect((await post().attach('file', Buffer.from('unit,value\nP1,1\n'), 'results.xlsx')).status).toBe(415);
    expect((await post().attach('file', TINY_PNG, { filename: 'photo.png', contentType: 'image/png' })).status).toBe(415);
    expect((await post().attach('file', Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), Buffer.alloc(100)]), 'zip.csv')).status).toBe(415);
    const hostile = '../../../../tmp/gillwise-security-escape.csv';
    const ok = await post().attach('file', Buffer.from('unit,sampled_at,value\nP1,2026-11-01T08:00:00Z,0.4\n'), hostile);
    expect(ok.status).toBe(201);
    // The client's name is shown back as text, never used to name a file.
    expect(ok.body.fileName).toContain('gillwise-security-escape.csv');
    expect(existsSync('/tmp/gillwise-security-escape.csv')).toBe(false);
    expect(listFiles().filter((n) => n.includes('escape'))).toEqual([]);
  });

  it('imports: a caller the route refuses gets its answer before any byte is written to disk', async () => {
    const route = importsRoute();
    if (!route) return;
    const before = listFiles().length;
    const url = fill(route.path, { farmId: fixture.farmId! });
    const hand = await request(t.app).post(url).set('cookie', await cookieFor(demoEmail('hand'))).set('x-gillwise-client', 'web').attach('file', Buffer.from('a,b\n1,2\n'), 'x.csv');
    const otherFarm = await request(t.app).post(url).set('cookie', await cookieFor(demoEmail('manager', 'cedarflats'))).set('x-gillwise-client', 'web').attach('file', Buffer.from('a,b\n1,2\n'), 'x.csv');
    const nobody = await request(t.app).post(url).set('x-gillwise-client', 'web').attach('file', Buffer.from('a,b\n1,2\n'), 'x.csv');
    expect([hand.status, otherFarm.status, nobody.status]).toEqual([403, 404, 401]);
    expect(listFiles().length).toBe(before);
  });

  it('photos: only JPEG, PNG or WebP by their bytes (not name or declared type), at most 8 MB, served as images with nosniff', async () => {
    const route = photoRoute();
    if (!route) return console.log('[security] uploads: no photo route in the registry; skipped');
    const cookie = await cookieFor();
    const example = route.example!(fixture);
    const url = fill(route.path, example.params ?? {});
    const post = () => request(t.app).post(url).set('cookie', cookie).set('x-gillwise-client', 'web');
    const field = example.upload?.field ?? 'photo';
    expect((await post().attach(field, Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"/>'), { filename: 'x.png', contentType: 'image/png' })).status).toBe(415);
    expect((await post().attach(field, Buffer.from('<html><script>alert(1)</script>'), { filename: 'x.jpg', contentType: 'image/jpeg' })).status).toBe(415);
    expect((await post().attach(field, Buffer.concat([TINY_PNG, Buffer.alloc(9 * 1024 * 1024)]), 'big.png')).status).toBe(413);
    const ok = await post().attach(field, TINY_PNG, '../../../../tmp/gillwise-security-photo.png');
    expect(ok.status).toBe(201);
    const photoUrl = ok.body.photoUrl as string;
    expect(photoUrl).toMatch(/\/photos\/[0-9a-f-]{36}\.png$/);
    expect(existsSync('/tmp/gillwise-security-photo.png')).toBe(false);
    const served = await request(t.app).get(photoUrl).set('cookie', cookie);
    expect(served.status).toBe(200);
    expect(served.headers['content-type']).toBe('image/png');
    expect(served.headers['x-content-type-options']).toBe('nosniff');
    // Another farm's manager cannot read it, and path tricks name nothing.
    const other = await request(t.app).get(photoUrl.replace(fixture.farmId!, fixture.otherFarmId!)).set('cookie', await cookieFor(demoEmail('manager', 'cedarflats')));
    expect(other.status).toBe(404);
    for (const name of ['..%2F..%2F..%2Fetc%2Fpasswd', '..%2Fphotos%2F' + FIXTURE_PHOTO, '%2Fetc%2Fpasswd']) {
      const res = await request(t.app).get(`/api/farms/${fixture.farmId}/photos/${name}`).set('cookie', cookie);
      expect(res.status, name).toBe(404);
    }
  });

  it('photos: a caller the route refuses gets 401/404 before the server reads the upload', async () => {
    const route = photoRoute();
    if (!route) return;
    const url = fill(route.path, route.example!(fixture).params ?? {});
    // Bytes that multer would refuse (a broken multipart body, then one over the limit): the refusal
    // must come from the access check, not from reading the body.
    const broken = (req: request.Test) => req.set('x-gillwise-client', 'web').set('content-type', 'multipart/form-data; boundary=x').send('--x\r\nnot a part');
    expect((await broken(request(t.app).post(url))).status).toBe(401);
    expect((await broken(request(t.app).post(url).set('cookie', await cookieFor(demoEmail('manager', 'cedarflats'))))).status).toBe(404);
  });
});
