// HTTP fuzz over the route registry: every route, signed in with a role it allows, gets its valid
// example mutated from its zod schemas (z.toJSONSchema): wrong types, missing and extra fields, huge
// strings, NaN-like and negative numbers, invalid UUIDs and dates, __proto__ keys, malformed and
// oversized bodies, junk query strings and path ids. Every answer is 2xx (the mutation happened to
// be valid) or 4xx in the one error shape `{ error: { code, message, details? } }`; never 5xx, never
// a stack trace.
import { existsSync, mkdirSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RouteDef, RouteFixture } from '../../server/http/route-registry';
import type { Role } from '../../shared/schemas/auth.schema';
import { buildRouteFixture, FIXTURE_PHOTO } from '../factories/route-fixture';
import { DEMO_PASSWORD } from '../factories/demo';
import { startTestApp, type TestApp } from '../setup/test-app';
import { bodyMutations, paramMutations, queryMutations, type Mutation } from './support/schema-mutations';

const TINY_PNG = 'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==';
/** A name that would land outside the data folder if an upload's file name were ever used as a path. */
const ESCAPE_NAME = 'gillwise-fuzz-escape';

let t: TestApp;
let fixture: RouteFixture;
const cookies = new Map<string, string>();
const ROLE_EMAIL: Record<Role, string> = {
  hand: 'hand@harrowbend.example',
  manager: 'manager@harrowbend.example',
  planner: 'planner@harrowbend.example',
  admin: 'admin@harrowbend.example',
};

beforeAll(async () => {
  t = await startTestApp();
  fixture = await buildRouteFixture(t.ds);
  mkdirSync(join(t.config.DATA_DIR, 'photos'), { recursive: true });
  writeFileSync(join(t.config.DATA_DIR, 'photos', FIXTURE_PHOTO), Buffer.from(TINY_PNG, 'base64'));
}, 120_000);
afterAll(() => t.close());

async function cookieFor(role: Role, fresh = false): Promise<string> {
  const cached = cookies.get(role);
  if (cached && !fresh) return cached;
  const res = await request(t.app).post('/api/auth/login').set('content-type', 'application/json').send({ email: ROLE_EMAIL[role], password: DEMO_PASSWORD });
  const raw = (res.headers['set-cookie'] as unknown as string[] | undefined)?.find((c) => c.startsWith('gw_session='));
  if (!raw) throw new Error(`sign-in as ${role} failed: ${res.status}`);
  const cookie = raw.split(';')[0]!;
  cookies.set(role, cookie);
  return cookie;
}

function roleFor(route: RouteDef): Role | null {
  if (route.access.kind === 'public') return null;
  if (route.access.kind === 'session') return 'manager';
  const roles = route.access.roles;
  return roles.includes('manager') ? 'manager' : roles.includes('admin') ? 'admin' : roles[0]!;
}

function fillPath(path: string, params: Record<string, string>): string {
  return path.replace(/:([A-Za-z]+)/g, (_m, name: string) => encodeURIComponent(params[name] ?? 'missing'));
}

type Upload = { field: string; base64: string; name: string };
type HttpMutation = Mutation & { upload?: { field: string; bytes: Buffer; name: string } | null };

/** Multipart uploads: no file, a wrong field, a wrong type, hostile names, too big. */
function uploadMutations(u: Upload): HttpMutation[] {
  const good = Buffer.from(u.base64, 'base64');
  const names = [`../../../../tmp/${ESCAPE_NAME}.png`, `..\\..\\${ESCAPE_NAME}.png`, `/etc/${ESCAPE_NAME}.png`, `${'a'.repeat(400)}.png`, '💧\u202Egnp.exe', '.htaccess', 'CON', ''];
  return [
    { name: 'upload missing (JSON body)', upload: null, body: {} },
    { name: 'upload in another field', upload: { field: 'other', bytes: good, name: u.name } },
    { name: 'upload text named like the example', upload: { field: u.field, bytes: Buffer.from('just text, no file signature'), name: u.name } },
    { name: 'upload SVG with script', upload: { field: u.field, bytes: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"/>'), name: 'x.svg' } },
    { name: 'upload HTML as CSV', upload: { field: u.field, bytes: Buffer.from('<html><script>alert(1)</script></html>'), name: 'x.html' } },
    { name: 'upload empty file', upload: { field: u.field, bytes: Buffer.alloc(0), name: u.name } },
    { name: 'upload 25 MB', upload: { field: u.field, bytes: Buffer.concat([good, Buffer.alloc(25 * 1024 * 1024, 0x41)]), name: u.name } },
    ...names.map((name, i) => ({ name: `upload hostile name #${i}`, upload: { field: u.field, bytes: good, name } })),
  ];
}

async function send(route: RouteDef, m: HttpMutation, example: ReturnType<NonNullable<RouteDef['example']>>, cookie: string | null) {
  const params = m.params ?? example.params ?? {};
  const query = { ...(m.query ?? example.query ?? {}), ...(route.kind === 'raw' ? { once: '1' } : {}) };
  let req = request(t.app)[route.method](fillPath(route.path, params)).set('x-gillwise-client', 'web').timeout(20_000);
  if (cookie) req = req.set('cookie', cookie);
  if (Object.keys(query).length) req = req.query(query as Record<string, string>);
  const upload = m.upload === undefined && example.upload ? { field: example.upload.field, bytes: Buffer.from(example.upload.base64, 'base64'), name: example.upload.name } : m.upload;
  if (upload && !m.rawBody && m.body === undefined) {
    req = req.attach(upload.field, upload.bytes, upload.name || 'unnamed');
  } else if (route.method !== 'get' && route.method !== 'delete') {
    req = req.set('content-type', m.contentType ?? 'application/json');
    req = req.send(m.rawBody ?? JSON.stringify(m.body !== undefined ? m.body : (example.body ?? {})));
  }
  return req;
}

const STACK = /\n\s+at |\.(?:ts|js|mjs|cjs):\d+|node_modules|\/work\/|TypeORMError|QueryFailedError/;

function problemWith(route: RouteDef, res: request.Response): string | null {
  // Health answers 503 when a dependency is down (no worker runs in this test): by design, not a fault.
  const by503 = route.path === '/api/health' && res.status === 503;
  if (res.status >= 500 && !by503) return `status ${res.status}`;
  const text = res.text ?? '';
  if (STACK.test(text)) return `internals in the body: ${text.slice(0, 200)}`;
  if (res.status >= 400 && !by503) {
    const body = res.body as unknown;
    if (!body || typeof body !== 'object' || Array.isArray(body)) return `${res.status} without a JSON error body`;
    const keys = Object.keys(body);
    if (keys.length !== 1 || keys[0] !== 'error') return `${res.status} with top-level keys ${keys.join(',')}`;
    const e = (body as { error: Record<string, unknown> }).error;
    if (typeof e.code !== 'string' || typeof e.message !== 'string') return `${res.status} error without code/message`;
    const extra = Object.keys(e).filter((k) => !['code', 'message', 'details'].includes(k));
    if (extra.length) return `${res.status} error with extra keys ${extra.join(',')}`;
  }
  return null;
}

describe('HTTP fuzz over every route in the registry', () => {
  it('answers every mutated request 2xx or 4xx in the error shape, never 5xx or a stack trace', async () => {
    const started = Date.now();
    const problems: string[] = [];
    const statuses: Record<string, number> = {};
    let requests = 0;
    const slowest: Array<[string, number]> = [];
    // Destructive routes last, so they do not remove what other examples use.
    const routes = [...t.routes].sort((a, b) => Number(a.method === 'delete') - Number(b.method === 'delete'));
    for (const route of routes) {
      const example = route.example ? route.example(fixture) : {};
      const role = roleFor(route);
      const mutations: HttpMutation[] = [
        ...paramMutations(example.params),
        ...queryMutations(route.query, example.query),
        ...(route.method !== 'get' && route.method !== 'delete' ? bodyMutations(route.body, example.body) : []),
        ...(example.upload ? uploadMutations(example.upload) : []),
      ];
      const routeStarted = Date.now();
      // A few requests at a time: they are independent, and the database work overlaps.
      let next = 0;
      const runOne = async (): Promise<void> => {
        while (next < mutations.length) {
          const m = mutations[next++]!;
          let res = await send(route, m, example, role ? await cookieFor(role) : null);
          // A mutation that happened to be valid may have ended the session (sign-out): sign in again.
          if (res.status === 401 && role) res = await send(route, m, example, await cookieFor(role, true));
          requests++;
          const bucket = `${Math.floor(res.status / 100)}xx`;
          statuses[bucket] = (statuses[bucket] ?? 0) + 1;
          const problem = problemWith(route, res);
          if (problem) problems.push(`${route.method.toUpperCase()} ${route.path} [${m.name}] → ${problem} ${JSON.stringify(res.body).slice(0, 200)}`);
        }
      };
      await Promise.all(Array.from({ length: route.method === 'delete' ? 1 : 4 }, runOne));
      slowest.push([`${route.method.toUpperCase()} ${route.path}`, Date.now() - routeStarted]);
    }
    console.log(
      `[fuzz] http: routes=${t.routes.length} requests=${requests} statuses=${JSON.stringify(statuses)} problems=${problems.length} slowest=${JSON.stringify(slowest.sort((a, b) => b[1] - a[1]).slice(0, 5))} seconds=${((Date.now() - started) / 1000).toFixed(1)}`,
    );
    expect(problems).toEqual([]);
    // No upload's file name was used as a path: nothing escaped, and stored files carry server-made names.
    expect(existsSync(`/tmp/${ESCAPE_NAME}.png`)).toBe(false);
    const stored = (readdirSync(t.config.DATA_DIR, { recursive: true }) as string[]).filter((n) => /escape|htaccess|💧|aaaaaaaa/.test(n));
    expect(stored).toEqual([]);
  });
});
