import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { outboxDetailSchema, outboxListSchema, type OutboxDetail, type OutboxList } from '../../shared/schemas/outbox.schema';
import { OutboxMessage } from '../../server/db/entities';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import { waitForMail } from '../setup/mail';
import { startTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
let farmId: string;

beforeAll(async () => {
  t = await startTestApp();
  farmId = (await seedDemoFarms(t.ds)).farms['harrow-bend']!;
}, 120_000);
afterAll(() => t.close());

const address = (tag: string) => `${tag}-${randomUUID().slice(0, 8)}@example.invalid`;

async function sendAlert(to: string, farm: string | null = farmId, kind: OutboxMessage['kind'] = 'alert') {
  const subject = `Free ammonia high on P1 (${randomUUID().slice(0, 6)})`;
  const row = await t.services.notifications.send({ farmId: farm, kind, to, subject, text: `NH3 0.07 mg/L on P1 at 15:10.\nCheck aeration and consider cutting feed.` });
  await waitForMail({ to });
  return row;
}

describe('the outbox', () => {
  it("lists a sent e-mail beside the mail catcher's copy, matched by its Message-ID, and shows the received text", async () => {
    const to = address('oncall');
    const row = await sendAlert(to);
    const manager = await signedIn(t.app, demoEmail('manager'));
    const res = await manager.get(`/api/farms/${farmId}/outbox`);
    expect(res.status).toBe(200);
    const list = outboxListSchema.parse(res.body);
    expect(list.catcherReachable).toBe(true);
    const listed = list.messages.find((m) => m.id === row.id);
    expect(listed).toMatchObject({ kind: 'alert', to, status: 'sent', delivery: 'received', received: { matchedBy: 'message_id', to: [to], subject: row.subject } });

    const detail = await manager.get(`/api/farms/${farmId}/outbox/${row.id}`);
    expect(detail.status).toBe(200);
    const one = outboxDetailSchema.parse(detail.body);
    expect(one.body).toBe('NH3 0.07 mg/L on P1 at 15:10.\nCheck aeration and consider cutting feed.');
    expect(one.receivedText).toContain('Check aeration and consider cutting feed.');
    expect(one.delivery).toBe('received');
  });

  it('falls back to recipient and subject, and tells apart a failed send and a sent message the catcher never got', async () => {
    const to = address('fallback');
    const row = await sendAlert(to);
    await t.ds.getRepository(OutboxMessage).update({ id: row.id }, { providerMessageId: null });
    const repo = t.ds.getRepository(OutboxMessage);
    const failed = await repo.save(repo.create({ farmId, kind: 'escalation', toAddress: address('failed'), subject: 'Escalation', body: 'x', status: 'failed', error: 'connect ECONNREFUSED' }));
    const lost = await repo.save(
      repo.create({ farmId, kind: 'alert', toAddress: address('lost'), subject: 'Never arrived', body: 'x', status: 'sent', providerMessageId: `<${randomUUID()}@gillwise.invalid>`, sentAt: new Date() }),
    );
    const manager = await signedIn(t.app, demoEmail('manager'));
    const list = (await manager.get(`/api/farms/${farmId}/outbox`).query({ limit: 200 })).body as OutboxList;
    const byId = new Map(list.messages.map((m) => [m.id, m]));
    expect(byId.get(row.id)).toMatchObject({ delivery: 'received', received: { matchedBy: 'recipient_subject' } });
    expect(byId.get(failed.id)).toMatchObject({ delivery: 'not_sent', status: 'failed', error: 'connect ECONNREFUSED', received: null });
    expect(byId.get(lost.id)).toMatchObject({ delivery: 'not_found', received: null });
  });

  it('shows admins the messages of no farm, pages them, and refuses a manager', async () => {
    const resets = [await sendAlert(address('reset-a'), null, 'password_reset'), await sendAlert(address('reset-b'), null, 'password_reset')];
    const farmRow = await sendAlert(address('farm'));
    const admin = await signedIn(t.app, demoEmail('admin'));
    const farmless = (await admin.get('/api/outbox').query({ limit: 200 })).body as OutboxList;
    const ids = farmless.messages.map((m) => m.id);
    expect(ids).toEqual(expect.arrayContaining(resets.map((r) => r.id)));
    expect(ids).not.toContain(farmRow.id);
    expect(farmless.messages.every((m) => m.farmId === null)).toBe(true);

    const all = (await admin.get('/api/outbox').query({ scope: 'all', limit: 200 })).body as OutboxList;
    expect(all.messages.map((m) => m.id)).toContain(farmRow.id);

    const first = (await admin.get('/api/outbox').query({ limit: 1 })).body as OutboxList;
    expect(first.nextCursor).not.toBeNull();
    const second = (await admin.get('/api/outbox').query({ limit: 1, cursor: first.nextCursor! })).body as OutboxList;
    expect(second.messages[0]!.id).not.toBe(first.messages[0]!.id);
    expect(Date.parse(second.messages[0]!.createdAt)).toBeLessThanOrEqual(Date.parse(first.messages[0]!.createdAt));

    const detail = await admin.get(`/api/outbox/${resets[0]!.id}`);
    expect(detail.status).toBe(200);
    expect((detail.body as OutboxDetail).receivedText).toContain('Check aeration');

    const manager = await signedIn(t.app, demoEmail('manager'));
    expect((await manager.get('/api/outbox')).status).toBe(403);
    // A farm-less message is not reachable under a farm.
    expect((await manager.get(`/api/farms/${farmId}/outbox/${resets[0]!.id}`)).status).toBe(404);
  });
});

describe('the outbox without a mail catcher', () => {
  let dark: TestApp;
  beforeAll(async () => {
    // Port 9 (discard) on loopback: nothing listens there, the connection is refused at once.
    dark = await startTestApp({ env: { MAIL_FAKE_API_URL: 'http://127.0.0.1:9' } });
  }, 120_000);
  afterAll(() => dark.close());

  it("answers the page with delivery 'unknown' instead of failing", async () => {
    const farm = (await seedDemoFarms(dark.ds)).farms['harrow-bend']!;
    const repo = dark.ds.getRepository(OutboxMessage);
    const sent = await repo.save(repo.create({ farmId: farm, kind: 'alert', toAddress: address('dark'), subject: 'Silent probe on R3', body: 'x', status: 'sent', providerMessageId: '<a@b>', sentAt: new Date() }));
    const manager = await signedIn(dark.app, demoEmail('manager'));
    const res = await manager.get(`/api/farms/${farm}/outbox`);
    expect(res.status).toBe(200);
    expect(outboxListSchema.parse(res.body).catcherReachable).toBe(false);
    expect(res.body.messages.find((m: { id: string }) => m.id === sent.id)).toMatchObject({ delivery: 'unknown', received: null });
    const detail = await manager.get(`/api/farms/${farm}/outbox/${sent.id}`);
    expect(detail.status).toBe(200);
    expect(detail.body).toMatchObject({ delivery: 'unknown', receivedText: null, catcherReachable: false });
  });
});
