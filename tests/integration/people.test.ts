import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/test-app';
import { waitForMail } from '../setup/mail';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import type { SeedResult } from '../../server/db/seed/seed';

let t: TestApp;
let seed: SeedResult;
let farmId: string;

beforeAll(async () => {
  t = await startTestApp();
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
});
afterAll(() => t.close());

const unique = (prefix: string) => `${prefix}-${crypto.randomUUID().slice(0, 8)}@harrowbend.example`;

describe('people on a farm', () => {
  it('lets a manager invite a hand, who receives a single-use link, sets a password and signs in', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const email = unique('invited');
    const res = await manager.post(`/api/farms/${farmId}/people`).send({ email, name: 'Rosa Linde', role: 'hand' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ email, role: 'hand', invited: true, active: true });
    const [mail] = await waitForMail({ to: email });
    expect(mail?.subject).toMatch(/invited to Harrow Bend Fish Farm/);
    const token = /token=([A-Za-z0-9_-]+)/.exec(mail?.text ?? '')?.[1];
    const set = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'rosa-chooses-this-one' });
    expect(set.status).toBe(204);
    const login = await request(t.app).post('/api/auth/login').send({ email, password: 'rosa-chooses-this-one' });
    expect(login.status).toBe(200);
    expect(login.body.farms).toEqual([expect.objectContaining({ slug: 'harrow-bend', role: 'hand' })]);
    const outbox = (await t.ds.query(`SELECT kind, status FROM outbox_messages WHERE to_address = $1`, [email])) as Array<{ kind: string; status: string }>;
    expect(outbox).toEqual([{ kind: 'invitation', status: 'sent' }]);
  });

  it('refuses a manager inviting another manager, and lets the admin do it', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const email = unique('boss');
    expect((await manager.post(`/api/farms/${farmId}/people`).send({ email, name: 'Second Manager', role: 'manager' })).status).toBe(403);
    const admin = await signedIn(t.app, demoEmail('admin'));
    expect((await admin.post(`/api/farms/${farmId}/people`).send({ email, name: 'Second Manager', role: 'manager' })).status).toBe(201);
  });

  it('deactivates a hand, which ends their session at once, and audits it', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const hand = await signedIn(t.app, demoEmail('hand'));
    expect((await hand.get('/api/me')).status).toBe(200);
    const handId = ((await t.ds.query(`SELECT id FROM users WHERE email = $1`, [demoEmail('hand')])) as Array<{ id: string }>)[0]!.id;
    const res = await manager.patch(`/api/farms/${farmId}/people/${handId}`).send({ active: false });
    expect(res.status).toBe(200);
    expect(res.body.active).toBe(false);
    expect((await hand.get('/api/me')).status).toBe(401);
    const audit = (await t.ds.query(`SELECT before, after FROM audit_events WHERE action = 'person.updated'`)) as Array<{ before: { active: boolean }; after: { active: boolean } }>;
    expect(audit.at(-1)).toMatchObject({ before: { active: true }, after: { active: false } });
  });

  it('answers a duplicate invitation with 409 beside the e-mail field', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const res = await manager.post(`/api/farms/${farmId}/people`).send({ email: demoEmail('planner'), name: 'Priya Raman', role: 'planner' });
    expect(res.status).toBe(409);
    expect(res.body.error.details.fieldErrors.email).toBeDefined();
  });
});
