import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import jwt from 'jsonwebtoken';
import { startTestApp, type TestApp } from '../setup/test-app';
import { waitForMail } from '../setup/mail';
import { DEMO_PASSWORD, demoEmail, seedDemoFarms } from '../factories/demo';
import { User } from '../../server/db/entities';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
  await seedDemoFarms(t.ds);
});
afterAll(() => t.close());

const login = (email: string, password = DEMO_PASSWORD) =>
  request(t.app).post('/api/auth/login').set('content-type', 'application/json').send({ email, password });
const cookieOf = (res: request.Response) => {
  const raw = res.headers['set-cookie'] as unknown as string[] | undefined;
  return raw?.find((c) => c.startsWith('gw_session=')) ?? '';
};

describe('sign-in', () => {
  it('sets an httpOnly SameSite session cookie and answers the user with their farms and roles', async () => {
    const res = await login(demoEmail('manager'));
    expect(res.status).toBe(200);
    const cookie = cookieOf(res);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/i);
    expect(res.body.user.email).toBe('manager@harrowbend.example');
    expect(res.body.farms).toEqual([expect.objectContaining({ slug: 'harrow-bend', role: 'manager', timeZone: 'America/Chicago' })]);
    const me = await request(t.app).get('/api/me').set('cookie', cookie.split(';')[0]!);
    expect(me.status).toBe(200);
    expect(me.body.user.name).toBe('Dale Whitcomb');
  });

  it('gives the admin every farm', async () => {
    const res = await login(demoEmail('admin'));
    expect(res.body.farms.map((f: { slug: string }) => f.slug).sort()).toEqual(['cedar-flats', 'harrow-bend']);
    expect(res.body.user.isAdmin).toBe(true);
  });

  it('answers a wrong password and an unknown e-mail with the same message', async () => {
    const wrong = await login(demoEmail('hand'), 'not-the-password');
    const unknown = await login('nobody@harrowbend.example', 'not-the-password');
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.code).toBe('invalid_credentials');
  });

  it('stores passwords as bcrypt hashes with a cost of at least 10', async () => {
    const user = await t.ds.getRepository(User).findOneByOrFail({ email: demoEmail('hand') });
    expect(user.passwordHash).toMatch(/^\$2[aby]\$(1[0-9]|[2-9][0-9])\$/);
  });

  it('refuses a form-encoded login (cross-site guard) and bad JSON with the error shape', async () => {
    const form = await request(t.app).post('/api/auth/login').type('form').send('email=a&password=b');
    expect(form.status).toBe(415);
    const bad = await request(t.app).post('/api/auth/login').set('content-type', 'application/json').send('{"email":');
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('malformed_json');
  });

  it('refuses a mutation from a foreign Origin', async () => {
    const res = await request(t.app)
      .post('/api/auth/login')
      .set('origin', 'http://evil.example')
      .set('content-type', 'application/json')
      .send({ email: demoEmail('hand'), password: DEMO_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('cross_site_refused');
  });

  it('clears the cookie on sign-out', async () => {
    const res = await request(t.app).post('/api/auth/logout').set('x-gillwise-client', 'web');
    expect(res.status).toBe(204);
    expect(cookieOf(res)).toMatch(/gw_session=;/);
  });
});

describe('session tokens', () => {
  const secret = () => t.config.JWT_SECRET;
  const user = async () => t.ds.getRepository(User).findOneByOrFail({ email: demoEmail('manager') });
  const meWith = (token: string) => request(t.app).get('/api/me').set('authorization', `Bearer ${token}`);

  it('accepts a valid bearer token for non-browser clients', async () => {
    const u = await user();
    const token = jwt.sign({ tv: u.tokenVersion }, secret(), { subject: u.id, audience: 'gillwise-web', issuer: 'gillwise', expiresIn: 60 });
    expect((await meWith(token)).status).toBe(200);
  });

  it('refuses a tampered signature, alg none, an expired token and a wrong audience with 401', async () => {
    const u = await user();
    const good = jwt.sign({ tv: u.tokenVersion }, secret(), { subject: u.id, audience: 'gillwise-web', issuer: 'gillwise', expiresIn: 60 });
    const [h, p] = good.split('.');
    const tampered = `${h}.${p}.${'A'.repeat(43)}`;
    const none = jwt.sign({ tv: u.tokenVersion, sub: u.id, aud: 'gillwise-web', iss: 'gillwise' }, '', { algorithm: 'none' });
    const expired = jwt.sign({ tv: u.tokenVersion, exp: Math.floor(Date.now() / 1000) - 10 }, secret(), { subject: u.id, audience: 'gillwise-web', issuer: 'gillwise' });
    const wrongAud = jwt.sign({ tv: u.tokenVersion }, secret(), { subject: u.id, audience: 'someone-else', issuer: 'gillwise', expiresIn: 60 });
    for (const token of [tampered, none, expired, wrongAud, 'garbage']) {
      const res = await meWith(token);
      expect(res.status).toBe(401);
      expect(res.body.error.code).toBe('unauthorized');
    }
  });
});

describe('password reset by e-mail', () => {
  it('e-mails a single-use link that sets a new password, and answers unknown addresses the same way', async () => {
    const email = demoEmail('planner');
    const unknown = await request(t.app).post('/api/auth/password-reset').send({ email: 'ghost@harrowbend.example' });
    const known = await request(t.app).post('/api/auth/password-reset').send({ email });
    expect(known.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(unknown.body).toEqual(known.body);

    const [mail] = await waitForMail({ to: email });
    const token = /reset-password\?token=([A-Za-z0-9_-]+)/.exec(mail?.text ?? '')?.[1];
    expect(token).toBeTruthy();
    const confirm = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'a-brand-new-passphrase' });
    expect(confirm.status).toBe(204);
    expect((await login(email, 'a-brand-new-passphrase')).status).toBe(200);
    expect((await login(email)).status).toBe(401);
    const again = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'another-passphrase-x' });
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('invalid_token');
  });
});

describe('rate limits', () => {
  it('answers 429 after too many sign-in attempts for one e-mail', async () => {
    const limited = await startTestApp();
    try {
      // The test app raises limits; build one with the production limits through the env-free factory.
      const { createApp } = await import('../../server/app');
      const { HealthService } = await import('../../server/modules/health/health.service');
      const { app } = createApp({
        config: limited.config,
        logger: (await import('../../server/lib/logger')).createLogger({ level: 'silent', name: 'rl' }),
        services: limited.services,
        health: new HealthService(limited.ds, limited.redis, 'x', () => ({ status: 'down' })),
        authLimits: { perIp: 100, perEmail: 3, windowMs: 60_000 },
        clientDir: null,
      });
      const statuses: number[] = [];
      for (let i = 0; i < 5; i++) {
        const res = await request(app).post('/api/auth/login').send({ email: 'victim@harrowbend.example', password: `guess-${i}` });
        statuses.push(res.status);
      }
      expect(statuses.slice(0, 3)).toEqual([401, 401, 401]);
      expect(statuses.slice(3)).toEqual([429, 429]);
    } finally {
      await limited.close();
    }
  });
});
