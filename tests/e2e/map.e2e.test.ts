// The farm map in a real browser: a manager watches a unit change status without reloading while a
// hand's kit result goes through the API and the worker, then acknowledges the alert from the map.
import type { Page, Response } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { startTestApp, type TestApp } from '../setup/test-app';
import { DEMO_PASSWORD, demoEmail, launchBrowser, signIn, viewports, watch, type TestBrowser } from './browser';

/** A signed-in API caller (as the hand's phone would be), through the same endpoints the browser uses. */
async function apiAs(baseUrl: string, role: 'hand' | 'manager') {
  const login = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-gillwise-client': 'web' },
    body: JSON.stringify({ email: demoEmail(role), password: DEMO_PASSWORD }),
  });
  expect(login.status).toBe(200);
  const cookie = (login.headers.getSetCookie?.() ?? [login.headers.get('set-cookie') ?? '']).map((c) => c.split(';')[0]).join('; ');
  return async (method: string, path: string, body?: unknown) => {
    const res = await fetch(`${baseUrl}${path}`, {
      method,
      headers: { cookie, 'x-gillwise-client': 'web', ...(body ? { 'content-type': 'application/json' } : {}) },
      body: body ? JSON.stringify(body) : undefined,
    });
    return { status: res.status, body: (await res.json().catch(() => null)) as Record<string, unknown> | null };
  };
}

const markerStatus = (page: Page, code: string) => page.locator(`[data-unit-marker="${code}"]`).getAttribute('data-status');

describe('the farm map in a real browser', () => {
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

  it('recolours a unit the moment a kit result puts it past its limit, without a reload, and the manager acknowledges the alert', async () => {
    const page = await browser.newPage(viewports.desktop);
    const seen = watch(page);
    const responses: Response[] = [];
    page.on('response', (r) => responses.push(r));
    let navigations = 0;
    page.on('framenavigated', (f) => {
      if (f === page.mainFrame()) navigations++;
    });

    await signIn(page, baseUrl, 'manager');
    await page.goto(`${baseUrl}/farms/${farmId}/map`, { waitUntil: 'load' });
    await page.locator('[data-testid="farm-map-canvas"][data-ready="true"]').waitFor({ timeout: 20_000 });
    await page.locator('[data-unit-marker="P3"]').waitFor({ state: 'attached' });
    const before = await markerStatus(page, 'P3');
    expect(before).not.toBe('act');
    const navigationsBefore = navigations;
    await page.evaluate(() => ((window as unknown as { gwStillHere: boolean }).gwStillHere = true));

    // The hand enters a kit result for P3: TAN 4 mg/L at pH 8.8 and 30 °C is far past any free-ammonia limit (computed ≈ 1.5 mg/L NH3).
    const hand = await apiAs(baseUrl, 'hand');
    const posted = await hand('POST', `/api/farms/${farmId}/units/${units['harrow-bend:P3']}/tests`, {
      clientId: crypto.randomUUID(),
      analyte: 'total_ammonia',
      method: 'salicylate',
      basis: 'tan-n',
      value: 4,
      handheldPh: 8.8,
      handheldTemperatureC: 30,
    });
    expect(posted.status).toBe(201);

    // The worker computes it, the evaluation opens an act alert, the live event refreshes the map.
    await expect.poll(() => markerStatus(page, 'P3'), { timeout: 30_000, interval: 250 }).toBe('act');
    expect(navigations).toBe(navigationsBefore);
    expect(await page.evaluate(() => (window as unknown as { gwStillHere?: boolean }).gwStillHere)).toBe(true);
    // The list beside the map says it in words too, and the change was announced.
    const row = page.locator('[data-unit-row="P3"]');
    expect(await row.getByRole('img', { name: `Status: ${en.status.act}` }).count()).toBe(1);
    await expect.poll(() => page.getByTestId('map-announcer').textContent()).toContain('P3');

    // Keyboard: the unit's button in the list opens the side sheet.
    await row.locator('[data-unit-button="P3"]').focus();
    await page.keyboard.press('Enter');
    const sheet = page.getByRole('dialog', { name: /^P3 · / });
    await sheet.waitFor();
    await sheet.getByTestId('free-ammonia').waitFor();
    const card = sheet.locator('[data-alert-kind="nh3_high"]');
    await card.waitFor({ timeout: 15_000 });
    expect(await card.getAttribute('data-alert-state')).toBe('open');
    await card.getByRole('button', { name: en.alerts.acknowledge }).click();
    await expect.poll(() => card.getAttribute('data-alert-state'), { timeout: 10_000 }).toBe('acknowledged');
    expect(await card.textContent()).toContain('Acknowledged by Dale Whitcomb');

    const manager = await apiAs(baseUrl, 'manager');
    const list = await manager('GET', `/api/farms/${farmId}/alerts?unitId=${units['harrow-bend:P3']}&kind=nh3_high`);
    expect((list.body?.alerts as Array<{ state: string }>)[0]?.state).toBe('acknowledged');

    // The map's worker came from this server (no "Worker failed to load"), and nothing left 127.0.0.1.
    const worker = responses.find((r) => /maplibre-gl-worker[^/]*\.mjs$/.test(new URL(r.url()).pathname));
    expect(worker?.status()).toBe(200);
    expect(worker?.headers()['content-type']).toMatch(/javascript/);
    expect(seen.offLoopback).toEqual([]);
    expect(seen.errors).toEqual([]);
    await page.close();
  });

  it('keeps the map out of the first load of the pondside screen', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.phone);
    const scripts: string[] = [];
    page.on('request', (r) => {
      if (r.resourceType() === 'script' || r.url().endsWith('.mjs')) scripts.push(new URL(r.url()).pathname);
    });
    await signIn(page, baseUrl, 'hand');
    scripts.length = 0;
    await page.goto(`${baseUrl}/farms/${farmId}/pondside-test`, { waitUntil: 'networkidle' });
    expect(scripts.length).toBeGreaterThan(0);
    expect(scripts.filter((s) => /maplibre|farm-map-canvas/.test(s))).toEqual([]);
    await page.close();
  });

  it('a phone gets the unit as a bottom sheet, and the map, list and sheet pass without console errors', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.phone);
    const seen = watch(page);
    await signIn(page, baseUrl, 'manager');
    await page.goto(`${baseUrl}/farms/${farmId}/map`, { waitUntil: 'load' });
    await page.locator('[data-testid="farm-map-canvas"][data-ready="true"]').waitFor({ timeout: 20_000 });
    await page.locator('[data-unit-card="R1"] button').click();
    const sheet = page.getByRole('dialog', { name: /^R1 · / });
    await sheet.waitFor();
    const box = await sheet.boundingBox();
    expect(box && box.y + box.height).toBeGreaterThan(viewports.phone.height - 4); // anchored to the bottom edge
    expect(box?.width).toBeGreaterThan(viewports.phone.width - 4);
    expect(await sheet.locator('[data-quantity="flow"]').count()).toBe(1);
    await page.keyboard.press('Escape');
    await sheet.waitFor({ state: 'hidden' });
    expect(seen.offLoopback).toEqual([]);
    expect(seen.errors).toEqual([]);
    await page.close();
  });
});
