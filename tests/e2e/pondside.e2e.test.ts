import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freeAmmonia } from '../../shared/chemistry';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { insertReadings, probeOf } from '../factories/readings';
import { startTestApp, type TestApp } from '../setup/test-app';
import { launchBrowser, signIn, viewports, watch, type TestBrowser } from './browser';

const MIN = 60_000;

describe('the pondside test in a real browser', () => {
  let app: TestApp;
  let baseUrl: string;
  let browser: TestBrowser;
  let farmId: string;
  let p1: string;

  beforeAll(async () => {
    app = await startTestApp({ serveClient: true, worker: true });
    const seed = await seedDemoFarms(app.ds);
    if (!app.baseUrl) throw new Error('no base URL');
    baseUrl = app.baseUrl;
    farmId = seed.farms['harrow-bend']!;
    p1 = seed.units['harrow-bend:P1']!;
    // The P1 sonde a few minutes either side of "now": the worker interpolates between them.
    const probeId = await probeOf(app.ds, p1);
    const now = Date.now();
    await insertReadings(app.ds, [
      { probeId, quantity: 'ph', at: new Date(now - 6 * MIN), value: 8.1 },
      { probeId, quantity: 'ph', at: new Date(now + 6 * MIN), value: 8.14 },
      { probeId, quantity: 'water_temperature', at: new Date(now - 6 * MIN), value: 27.0 },
      { probeId, quantity: 'water_temperature', at: new Date(now + 6 * MIN), value: 27.2 },
    ]);
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('a hand on a phone enters a kit result and sees the free ammonia at once, then the stored result with its provenance', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.phone);
    const seen = watch(page);
    await signIn(page, baseUrl, 'hand');
    // The hand lands on today's tasks.
    await page.getByTestId('task-board').waitFor();

    await page.goto(`${baseUrl}/farms/${farmId}/units/${p1}/test`, { waitUntil: 'load' });
    await page.getByTestId('chosen-unit').waitFor();
    expect(await page.getByTestId('chosen-unit').textContent()).toContain('P1');
    await page.getByTestId('probe-now').filter({ hasText: 'pH 8.14' }).waitFor();

    // Salicylate, TAN as N are the defaults; tap the "1" card step.
    await page.getByRole('group', { name: en.pondside.reading.steps }).getByRole('button', { name: '1', exact: true }).click();
    const instant = page.getByTestId('instant-result-value');
    await instant.waitFor();
    const expected = freeAmmonia({ readingMgL: 1, basis: 'tan-n', pH: 8.14, temperatureC: 27.2, salinityPpt: 0 }); // computed
    expect(await instant.textContent()).toBe(expected.nh3MgL.toFixed(3));

    await page.getByTestId('save-test').click();
    const stored = page.getByTestId('stored-result-value');
    await stored.waitFor({ timeout: 30_000 });
    const provPh = await page.getByTestId('prov-ph').textContent();
    expect(provPh).toMatch(/^pH 8\.1\d from probe P1 sonde at \d\d:\d\d, interpolated between the readings at \d\d:\d\d and \d\d:\d\d$/);
    expect(await page.getByTestId('prov-water_temperature').textContent()).toMatch(/°C from probe P1 sonde at/);
    expect(await page.getByTestId('send-state').getAttribute('data-state')).toBe('stored');
    // The interpolated pH and temperature sit between the two readings, so does the stored free ammonia (computed).
    const low = freeAmmonia({ readingMgL: 1, basis: 'tan-n', pH: 8.1, temperatureC: 27.0, salinityPpt: 0 }).nh3MgL;
    const high = freeAmmonia({ readingMgL: 1, basis: 'tan-n', pH: 8.14, temperatureC: 27.2, salinityPpt: 0 }).nh3MgL;
    const shown = Number(await stored.textContent());
    expect(shown).toBeGreaterThanOrEqual(Math.floor(low * 1000) / 1000);
    expect(shown).toBeLessThanOrEqual(Math.ceil(high * 1000) / 1000);

    // One row on the server, through the API the hand is allowed to read.
    const res = await page.request.get(`${baseUrl}/api/farms/${farmId}/units/${p1}/tests?analyte=total_ammonia&limit=5`);
    const { tests } = (await res.json()) as { tests: Array<{ source: string; value: number; sampledAt: string; result: unknown }> };
    const mine = tests.filter((x) => Math.abs(Date.now() - Date.parse(x.sampledAt)) < 5 * MIN);
    expect(mine).toHaveLength(1);
    expect(mine[0]?.value).toBe(1);
    expect(mine[0]?.result).toBeTruthy();

    expect(seen.offLoopback).toEqual([]);
    expect(seen.errors).toEqual([]);
    await page.close();
  });

  it('a QR label opens the pondside test of its unit', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.phone);
    await signIn(page, baseUrl, 'hand');
    const label = await page.request.get(`${baseUrl}/api/farms/${farmId}/units/${p1}/label`);
    const { url } = (await label.json()) as { url: string };
    const path = new URL(url).pathname + new URL(url).search;
    await page.goto(`${baseUrl}${path}`, { waitUntil: 'load' });
    await page.getByText(en.pondside.fromLabel.replace('{{code}}', 'P1')).waitFor();
    expect(await page.getByTestId('chosen-unit').textContent()).toContain('P1');

    await page.goto(`${baseUrl}/farms/${farmId}/units/${p1}/label`, { waitUntil: 'load' });
    await page.getByTestId('label-qr').first().waitFor();
    expect(await page.getByTestId('label-sheet').textContent()).toContain('Pond 1');
    await page.close();
  });
});
