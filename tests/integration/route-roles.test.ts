// The route × role matrix, walked from the route registry itself: every route answers 401 without a
// session, 403 to a farm role it does not allow, 2xx to one it does, and 404 across farms. A route
// added without an access rule or an example fails here.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RouteDef, RouteFixture } from '../../server/http/route-registry';
import type { Role } from '../../shared/schemas/auth.schema';
import { startTestApp, type TestApp } from '../setup/test-app';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { buildRouteFixture, FIXTURE_PHOTO } from '../factories/route-fixture';
import { DEMO_PASSWORD } from '../factories/demo';

let t: TestApp;
let fixture: RouteFixture;
const tokens = new Map<string, string>();
const ROLE_EMAIL: Record<Role, string> = {
  hand: 'hand@harrowbend.example',
  manager: 'manager@harrowbend.example',
  planner: 'planner@harrowbend.example',
  admin: 'admin@harrowbend.example',
};
const OTHER_FARM_MANAGER = 'manager@cedarflats.example';

async function cookieFor(email: string): Promise<string> {
  const cached = tokens.get(email);
  if (cached) return cached;
  const res = await request(t.app).post('/api/auth/login').set('content-type', 'application/json').send({ email, password: DEMO_PASSWORD });
  const raw = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('gw_session='))!;
  const cookie = raw.split(';')[0]!;
  tokens.set(email, cookie);
  return cookie;
}

function fillPath(path: string, params: Record<string, string>): string {
  return path.replace(/:([A-Za-z]+)/g, (_m, name: string) => {
    const v = params[name];
    if (v === undefined) throw new Error(`no value for :${name} in ${path}`);
    return encodeURIComponent(v);
  });
}

async function call(route: RouteDef, params: Record<string, string>, cookie: string | null, example: ReturnType<NonNullable<RouteDef['example']>>) {
  const url = fillPath(route.path, params) + (route.kind === 'raw' ? '?once=1' : '');
  let req = request(t.app)[route.method](url).set('x-gillwise-client', 'web');
  if (cookie) req = req.set('cookie', cookie);
  if (example.query) req = req.query(example.query as Record<string, string>);
  if (example.upload) req = req.attach(example.upload.field, Buffer.from(example.upload.base64, 'base64'), example.upload.name);
  else if (route.method !== 'get' && route.method !== 'delete') req = req.set('content-type', 'application/json').send(JSON.stringify(example.body ?? {}));
  return req;
}

beforeAll(async () => {
  t = await startTestApp();
  fixture = await buildRouteFixture(t.ds);
  mkdirSync(join(t.config.DATA_DIR, 'photos'), { recursive: true });
  writeFileSync(join(t.config.DATA_DIR, 'photos', FIXTURE_PHOTO), Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==', 'base64'));
}, 120_000);
afterAll(() => t.close());

describe('the route × role matrix', () => {
  it('has an access rule and an example for every route that needs a session', () => {
    const missing = t.routes.filter((r) => r.access.kind !== 'public' && !r.example).map((r) => `${r.method.toUpperCase()} ${r.path}`);
    expect(missing).toEqual([]);
  });

  it('answers every protected route with 401 without a session', async () => {
    const wrong: string[] = [];
    for (const route of t.routes.filter((r) => r.access.kind !== 'public')) {
      const example = route.example!(fixture);
      const res = await call(route, example.params ?? {}, null, example);
      if (res.status !== 401) wrong.push(`${route.method.toUpperCase()} ${route.path} → ${res.status}`);
    }
    expect(wrong).toEqual([]);
  });

  it('answers 403 to a farm role a route does not allow, and 2xx to one it does', async () => {
    const wrong: string[] = [];
    // Destructive routes last, so they do not remove what other examples use.
    const ordered = [...t.routes].sort((a, b) => Number(a.method === 'delete') - Number(b.method === 'delete'));
    for (const route of ordered.filter((r) => r.access.kind === 'roles' || r.access.kind === 'session')) {
      const example = route.example!(fixture);
      const allowed: Role[] = route.access.kind === 'roles' ? [...route.access.roles] : ['hand', 'manager', 'planner', 'admin'];
      const denied = (['hand', 'planner', 'manager'] as Role[]).filter((r) => !allowed.includes(r));
      for (const role of denied) {
        const res = await call(route, example.params ?? {}, await cookieFor(ROLE_EMAIL[role]), example);
        if (res.status !== 403) wrong.push(`${role} ${route.method.toUpperCase()} ${route.path} → ${res.status} (want 403)`);
      }
      const role = allowed.includes('manager') ? 'manager' : allowed[0]!;
      const res = await call(route, example.params ?? {}, await cookieFor(ROLE_EMAIL[role]), route.example!(fixture));
      if (res.status < 200 || res.status >= 300) wrong.push(`${role} ${route.method.toUpperCase()} ${route.path} → ${res.status} ${JSON.stringify(res.body).slice(0, 160)} (want 2xx)`);
    }
    expect(wrong).toEqual([]);
  });

  it("answers 404 to a manager of another farm for this farm's routes and for this farm's ids under their own farm", async () => {
    const wrong: string[] = [];
    const cookie = await cookieFor(OTHER_FARM_MANAGER);
    for (const route of t.routes.filter((r) => r.access.kind === 'roles' && r.access.farmScoped)) {
      if (route.access.kind !== 'roles') continue;
      const access = route.access;
      const example = route.example!(fixture);
      const res = await call(route, example.params ?? {}, cookie, example);
      if (res.status !== 404) wrong.push(`${route.method.toUpperCase()} ${route.path} → ${res.status} (want 404)`);
      // This farm's unit and probe ids, asked for under the other manager's own farm.
      if (route.path.includes(':unitId') || route.path.includes(':probeId')) {
        const params = { ...(example.params ?? {}), farmId: fixture.otherFarmId! };
        const crossed = await call(route, params, cookie, example);
        if (crossed.status !== 404 && !(!access.roles.includes('manager') && crossed.status === 403)) {
          wrong.push(`cross-farm id ${route.method.toUpperCase()} ${route.path} → ${crossed.status} (want 404)`);
        }
      }
    }
    expect(wrong).toEqual([]);
  });

  it('answers errors in the one error shape, never with a stack trace', async () => {
    const res = await request(t.app).get('/api/farms/not-a-uuid/units').set('cookie', await cookieFor(ROLE_EMAIL.manager));
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'not_found', message: expect.any(String) } });
    const unknown = await request(t.app).get('/api/no-such-route');
    expect(unknown.status).toBe(404);
    expect(JSON.stringify(unknown.body)).not.toMatch(/at .*\.ts/);
  });

  it('serves an OpenAPI document listing every route', async () => {
    const res = await request(t.app).get('/api/openapi.json');
    expect(res.status).toBe(200);
    const paths = Object.entries(res.body.paths as Record<string, Record<string, unknown>>).flatMap(([p, ops]) => Object.keys(ops).map((m) => `${m} ${p}`));
    for (const r of t.routes) expect(paths).toContain(`${r.method} ${r.path.replace(/:([A-Za-z]+)/g, '{$1}')}`);
  });
});
