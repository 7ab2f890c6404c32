// An admin invites someone from Setup › People in a real browser, and the invitation shows up in the
// Outbox as the local mail catcher received it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { startTestApp, type TestApp } from '../setup/test-app';
import { launchBrowser, navKeys, signIn, viewports, watch, type TestBrowser } from './browser';

describe('invitations and the outbox in a real browser', () => {
  let app: TestApp;
  let baseUrl: string;
  let farmId: string;
  let browser: TestBrowser;

  beforeAll(async () => {
    app = await startTestApp({ serveClient: true, worker: true });
    const seed = await seedDemoFarms(app.ds);
    farmId = seed.farms['harrow-bend']!;
    if (!app.baseUrl) throw new Error('no base URL');
    baseUrl = app.baseUrl;
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('an admin invites a new hand, and the invitation e-mail is in the Outbox as received', async () => {
    const page = await browser.newPage(viewports.desktop);
    const seen = watch(page);
    await signIn(page, baseUrl, 'admin');
    // An admin sees every farm; work on Harrow Bend.
    await page.goto(`${baseUrl}/farms/${farmId}`, { waitUntil: 'load' });
    await page.getByTestId('side-nav').locator('[data-nav-key="people"]').waitFor();
    expect(await navKeys(page, 'side-nav')).toEqual(expect.arrayContaining(['setup', 'people', 'outbox']));

    await page.getByTestId('side-nav').locator('[data-nav-key="people"]').click();
    const form = page.getByTestId('invite-form');
    await form.waitFor();
    const email = `lucia.ferrer.${Date.now()}@harrowbend.example`;
    // Sent empty first: the errors sit beside the fields and nothing is sent.
    await form.getByRole('button', { name: en.setup.people.send }).click();
    await expect.poll(() => form.getByLabel(en.setup.people.email, { exact: true }).getAttribute('aria-invalid')).toBe('true');
    await form.getByLabel(en.setup.people.name, { exact: true }).fill('Lucía Ferrer');
    await form.getByLabel(en.setup.people.email, { exact: true }).fill(email);
    await form.getByLabel(en.setup.people.role, { exact: true }).selectOption('hand');
    await form.getByLabel(en.setup.people.language).selectOption('es');
    await form.getByRole('button', { name: en.setup.people.send }).click();
    await page.getByText(`Lucía Ferrer is invited; the e-mail went to ${email}.`).waitFor();
    const person = page.locator(`[data-testid="person"][data-email="${email}"]`);
    await person.waitFor();
    expect(await person.textContent()).toContain(en.setup.people.invitePending);

    await page.getByRole('link', { name: en.setup.people.seeOutbox }).click();
    await page.waitForURL(/\/outbox$/);
    const message = page.locator(`[data-testid="outbox-message"][data-kind="invitation"][data-to="${email}"]`);
    await expect
      .poll(
        async () => {
          await page.reload({ waitUntil: 'load' });
          await page.getByTestId('outbox').waitFor();
          return (await message.count()) > 0 ? await message.textContent() : '';
        },
        { timeout: 20_000, interval: 750 },
      )
      .toContain(en.outbox.delivery.received);
    expect(await message.getByTestId('outbox-subject').textContent()).toBe('Gillwise: le invitaron a Harrow Bend Fish Farm');
    await message.getByRole('button').first().click();
    const received = message.getByTestId('outbox-received');
    await received.waitFor();
    expect(await received.textContent()).toContain('Elija su contraseña con este enlace');
    expect(await received.textContent()).toMatch(/\/reset-password\?token=/);

    expect(seen.offLoopback).toEqual([]);
    expect(seen.errors).toEqual([]);
    await page.close();
  });
});
