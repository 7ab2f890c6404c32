import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import nodemailer from 'nodemailer';
import { afterEach, describe, expect, it } from 'vitest';
import { startSmtpFake, type CaughtMessage, type SmtpFake } from '../../scripts/stack/smtp-fake.mjs';

const fakes: SmtpFake[] = [];
const dirs: string[] = [];

afterEach(async () => {
  await Promise.all(fakes.splice(0).map((f) => f.close()));
  for (const dir of dirs.splice(0)) rmSync(dir, { recursive: true, force: true });
});

async function start(options: Parameters<typeof startSmtpFake>[0] = {}): Promise<SmtpFake> {
  const fake = await startSmtpFake({ smtpPort: 0, apiPort: 0, ...options });
  fakes.push(fake);
  return fake;
}

function tempDir(): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'gw-smtp-fake-'));
  dirs.push(dir);
  return dir;
}

function transport(fake: SmtpFake) {
  return nodemailer.createTransport({ host: '127.0.0.1', port: fake.smtpPort, secure: false, ignoreTLS: true });
}

async function getJson<T>(url: string, init?: RequestInit): Promise<{ status: number; body: T }> {
  const res = await fetch(url, init);
  return { status: res.status, body: (await res.json()) as T };
}

describe('SMTP fake', () => {
  it('stores a message sent with nodemailer and returns it over the HTTP API', async () => {
    const fake = await start();
    await transport(fake).sendMail({
      from: 'Gillwise <alerts@gillwise.invalid>',
      to: 'Pond Hand <Hand@Harrowbend.example>',
      bcc: 'oncall@harrowbend.example',
      subject: 'Low dissolved oxygen in Pond 3',
      text: 'DO is 3.1 mg/L',
      html: '<p>DO is <b>3.1 mg/L</b></p>',
      headers: { 'X-Gillwise-Alert-Id': 'alert-42' },
      attachments: [{ filename: 'readings.csv', content: 'at,doMgL\n2026-01-01T00:00:00Z,3.1\n', contentType: 'text/csv' }],
    });

    const list = await getJson<{ messages: CaughtMessage[] }>(`${fake.apiUrl}/messages?to=hand@harrowbend.example`);
    expect(list.status).toBe(200);
    expect(list.body.messages).toHaveLength(1);
    const [summary] = list.body.messages;
    expect(summary).toMatchObject({
      from: 'Gillwise <alerts@gillwise.invalid>',
      fromAddress: 'alerts@gillwise.invalid',
      to: ['hand@harrowbend.example', 'oncall@harrowbend.example'],
      headerTo: ['hand@harrowbend.example'],
      subject: 'Low dissolved oxygen in Pond 3',
      text: 'DO is 3.1 mg/L',
      html: '<p>DO is <b>3.1 mg/L</b></p>',
      headers: { 'x-gillwise-alert-id': 'alert-42' },
      attachments: [{ filename: 'readings.csv', contentType: 'text/csv' }],
    });
    expect(summary?.headers['message-id']).toMatch(/^<.+>$/);
    expect(summary?.attachments[0]).not.toHaveProperty('contentBase64');

    const one = await getJson<CaughtMessage>(`${fake.apiUrl}/messages/${summary?.id}`);
    expect(one.status).toBe(200);
    expect(Buffer.from(one.body.attachments[0]?.contentBase64 ?? '', 'base64').toString()).toContain('3.1');

    const bccOnly = await getJson<{ messages: CaughtMessage[] }>(`${fake.apiUrl}/messages?to=ONCALL@harrowbend.example`);
    expect(bccOnly.body.messages.map((m) => m.id)).toEqual([summary?.id]);
    const nobody = await getJson<{ messages: CaughtMessage[] }>(`${fake.apiUrl}/messages?to=nobody@example.invalid`);
    expect(nobody.body.messages).toEqual([]);
  });

  it('lists newest first, honours limit, forgets everything on DELETE and answers 404 for unknown ids', async () => {
    const fake = await start();
    const mailer = transport(fake);
    for (const n of [1, 2, 3]) {
      await mailer.sendMail({ from: 'a@example.invalid', to: 'b@example.invalid', subject: `message ${n}`, text: 'x' });
    }
    const two = await getJson<{ messages: CaughtMessage[] }>(`${fake.apiUrl}/messages?limit=2`);
    expect(two.body.messages.map((m) => m.subject)).toEqual(['message 3', 'message 2']);

    const deleted = await getJson<{ deleted: number }>(`${fake.apiUrl}/messages`, { method: 'DELETE' });
    expect(deleted.body.deleted).toBe(3);
    expect((await getJson<{ messages: CaughtMessage[] }>(`${fake.apiUrl}/messages`)).body.messages).toEqual([]);
    expect((await getJson(`${fake.apiUrl}/messages/does-not-exist`)).status).toBe(404);
  });

  it('keeps only the newest messages on disk and reloads them after a restart', async () => {
    const storeDir = tempDir();
    const first = await start({ storeDir, keep: 2 });
    const mailer = transport(first);
    for (const n of [1, 2, 3]) {
      await mailer.sendMail({ from: 'a@example.invalid', to: 'b@example.invalid', subject: `kept ${n}`, text: 'x' });
    }
    expect(readdirSync(storeDir).filter((f) => f.endsWith('.json'))).toHaveLength(2);
    await first.close();

    const second = await start({ storeDir, keep: 2 });
    const list = await getJson<{ messages: CaughtMessage[] }>(`${second.apiUrl}/messages`);
    expect(list.body.messages.map((m) => m.subject)).toEqual(['kept 3', 'kept 2']);
  });
});
