// The alerts screen in a real browser: an alert appears live while the manager has the list open, is
// assigned to a hand and resolved with a note, and then shows under Resolved; a hand may only acknowledge.
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { startTestApp, type TestApp } from '../setup/test-app';
import { DEMO_PASSWORD, demoEmail, launchBrowser, signIn, viewports, watch, type TestBrowser } from './browser';

async function postKitResult(baseUrl: string, farmId: string, unitId: string, tanMgL: number) {
  const login = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: demoEmail('hand'), password: DEMO_PASSWORD }),
  });
  const cookie = login.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
  const res = await fetch(`${baseUrl}/api/farms/${farmId}/units/${unitId}/tests`, {
    method: 'POST',
    headers: { cookie, 'x-gillwise-client': 'web', 'content-type': 'application/json' },
    body: JSON.stringify({
      clientId: crypto.randomUUID(),
      analyte: 'total_ammonia',
      method: 'salicylate',
      basis: 'tan-n',
      value: tanMgL,
      handheldPh: 8.8,
      handheldTemperatureC: 30,
    }),
  });
  expect(res.status).toBe(201);
}

const nh3Card = (page: Page, code: string) => page.locator('[data-alert-kind="nh3_high"]').filter({ hasText: code });

describe('the alerts screen in a real browser', () => {
  let app: TestApp;
  let baseUrl: string;
  let browser: TestBrowser;
  let farmId: string;
  let units: Record<string, string>;

  beforeAll(async () => {
    app = await startTestApp({ serveClient: true, worker: true });
    const seeded = await seedDemoFarms(app.ds);
    farmId = seeded.farms['harrow-bend']!;
    units = seeded.units;
    if (!app.baseUrl) throw new Error('startTestApp({ serveClient: true }) gave no base URL');
    baseUrl = app.baseUrl;
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('shows a new alert without a reload, assigns it and resolves it with a note', async () => {
    const page = await browser.newPage(viewports.desktop);
    const seen = watch(page);
    await signIn(page, baseUrl, 'manager');
    await page.goto(`${baseUrl}/farms/${farmId}/alerts?unit=${units['harrow-bend:P4']}`, { waitUntil: 'load' });
    await page.getByText(en.alerts.empty.open).waitFor();
    expect(await page.getByText(en.cautions.thresholds).first().isVisible()).toBe(true);

    await postKitResult(baseUrl, farmId, units['harrow-bend:P4']!, 4);
    const card = nh3Card(page, 'P4');
    await card.waitFor({ timeout: 30_000 });
    expect(await card.getByRole('img', { name: `Status: ${en.status.act}` }).count()).toBe(1);
    // P4 holds tilapia: the seeded profile's act limit is 0.1 mg/L NH3 (product decision in the seed); 4 mg/L TAN at pH 8.8, 30 °C ≈ 1.64 mg/L NH3 (computed).
    expect(await card.textContent()).toMatch(/Measured 1\.6\d mg\/L NH3, act limit 0\.1 mg\/L NH3/);

    await card.getByRole('button', { name: en.alerts.assign.open }).click();
    const assign = page.getByRole('dialog', { name: en.alerts.assign.title });
    await assign.getByRole('combobox', { name: new RegExp(en.alerts.assign.person) }).selectOption({ label: 'Marisol Ortega (Farm hand)' });
    await assign.getByRole('button', { name: en.alerts.assign.submit }).click();
    await expect.poll(() => card.textContent(), { timeout: 10_000 }).toContain('Assigned to Marisol Ortega');

    await card.getByRole('button', { name: en.alerts.resolve.open }).click();
    const resolve = page.getByRole('dialog', { name: en.alerts.resolve.title });
    await resolve.getByLabel(en.alerts.resolve.note).fill('Fed nothing today, 30 % water exchange; re-test at 15:00.');
    await resolve.getByRole('button', { name: en.alerts.resolve.submit }).click();
    await resolve.waitFor({ state: 'hidden' });

    // The screen says where the alert went and takes the manager there.
    await page.getByRole('status').filter({ hasText: 'Resolved: Free ammonia high — P4' }).waitFor();
    await page.getByRole('button', { name: en.alerts.done.show.resolved }).click();
    await page.waitForURL(/state=resolved/);
    const resolved = nh3Card(page, 'P4').filter({ hasText: 'Fed nothing today' });
    await resolved.waitFor({ timeout: 10_000 });
    expect(await resolved.getAttribute('data-alert-state')).toBe('resolved');
    expect(seen.offLoopback).toEqual([]);
    expect(seen.errors).toEqual([]);
    await page.close();
  });

  it('lets a hand on a phone acknowledge, but offers no assign or resolve', async () => {
    await browser.context.clearCookies();
    await postKitResult(baseUrl, farmId, units['harrow-bend:P6']!, 4);
    await app.drain({ timeoutMs: 30_000 });
    const page = await browser.newPage(viewports.phone);
    const seen = watch(page);
    await signIn(page, baseUrl, 'hand');
    await page.goto(`${baseUrl}/farms/${farmId}/alerts?kind=nh3_high`, { waitUntil: 'load' });
    const card = nh3Card(page, 'P6');
    await card.waitFor({ timeout: 20_000 });
    expect(await card.getByRole('button', { name: en.alerts.assign.open }).count()).toBe(0);
    expect(await card.getByRole('button', { name: en.alerts.resolve.open }).count()).toBe(0);
    await card.getByRole('button', { name: en.alerts.acknowledge }).click();
    await page.getByRole('status').filter({ hasText: 'Acknowledged: Free ammonia high — P6' }).waitFor({ timeout: 10_000 });
    await page.getByRole('button', { name: en.alerts.done.show.acknowledged }).click();
    await page.waitForURL(/state=acknowledged/);
    await expect.poll(() => nh3Card(page, 'P6').getAttribute('data-alert-state'), { timeout: 10_000 }).toBe('acknowledged');
    expect(seen.offLoopback).toEqual([]);
    expect(seen.errors).toEqual([]);
    await page.close();
  });
});
