// The unit page in a real browser: probe charts from the series API, the kit result with its
// provenance in words, the EPA 2013 reference for fresh water, and the range in the address.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { insertReadings, probeOf, type ReadingSpec } from '../factories/readings';
import { startTestApp, type TestApp } from '../setup/test-app';
import { DEMO_PASSWORD, demoEmail, launchBrowser, signIn, viewports, watch, type TestBrowser } from './browser';

describe('the unit page in a real browser', () => {
  let app: TestApp;
  let baseUrl: string;
  let browser: TestBrowser;
  let farmId: string;
  let unitId: string;

  beforeAll(async () => {
    app = await startTestApp({ serveClient: true, worker: true });
    const seeded = await seedDemoFarms(app.ds);
    farmId = seeded.farms['harrow-bend']!;
    unitId = seeded.units['harrow-bend:P1']!;
    // Two days of invented probe readings every 10 minutes: a daily pH and temperature swing, one suspect spike.
    const probeId = await probeOf(app.ds, unitId);
    const rows: ReadingSpec[] = [];
    const now = Date.now();
    for (let t = now - 2 * 86_400_000; t <= now; t += 600_000) {
      const phase = Math.sin(((t / 3_600_000) % 24) * ((2 * Math.PI) / 24));
      rows.push({ probeId, quantity: 'ph', at: new Date(t), value: 7.8 + 0.4 * phase });
      rows.push({ probeId, quantity: 'water_temperature', at: new Date(t), value: 26 + 2 * phase });
      rows.push({ probeId, quantity: 'dissolved_oxygen', at: new Date(t), value: 6 + 1.5 * phase });
    }
    rows.push({ probeId, quantity: 'ph', at: new Date(now - 3_600_000 - 60_000), value: 9.6, quality: 'suspect' });
    await insertReadings(app.ds, rows);

    const login = await fetch(`${app.baseUrl}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: demoEmail('hand'), password: DEMO_PASSWORD }),
    });
    const cookie = login.headers
      .getSetCookie()
      .map((c) => c.split(';')[0])
      .join('; ');
    const res = await fetch(`${app.baseUrl}/api/farms/${farmId}/units/${unitId}/tests`, {
      method: 'POST',
      headers: { cookie, 'x-gillwise-client': 'web', 'content-type': 'application/json' },
      body: JSON.stringify({
        clientId: crypto.randomUUID(),
        analyte: 'total_ammonia',
        method: 'salicylate',
        basis: 'tan-n',
        value: 0.9,
        sampledAt: new Date(now - 5 * 60_000).toISOString(),
      }),
    });
    expect(res.status).toBe(201);
    await app.drain({ timeoutMs: 30_000 });
    if (!app.baseUrl) throw new Error('startTestApp({ serveClient: true }) gave no base URL');
    baseUrl = app.baseUrl;
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('draws the probe charts, tells where the kit result’s pH came from and switches range', async () => {
    const page = await browser.newPage(viewports.desktop);
    const seen = watch(page);
    await signIn(page, baseUrl, 'manager');
    await page.goto(`${baseUrl}/farms/${farmId}/units/${unitId}`, { waitUntil: 'load' });

    for (const q of ['ph', 'water_temperature', 'dissolved_oxygen']) {
      const chart = page.getByTestId(`chart-${q}`);
      await chart.locator('canvas').waitFor({ timeout: 30_000 });
    }
    expect(await page.getByTestId('chart-ph').textContent()).toContain(en.units.chart.suspectKey);
    await page.getByTestId('chart-ammonia').locator('canvas').waitFor();

    // The kit result's pH came from the probe, interpolated between the readings either side.
    const results = page.getByTestId('results-list');
    await expect
      .poll(() => results.textContent(), { timeout: 15_000 })
      .toMatch(/pH \d\.\d\d from probe P1 sonde at \d\d:\d\d, interpolated between readings at \d\d:\d\d and \d\d:\d\d/);
    expect(await results.textContent()).toContain("the unit's default");

    // Fresh water: the EPA 2013 criteria are shown, labelled as ambient criteria.
    const epa = page.getByTestId('epa-reference');
    expect(await epa.textContent()).toContain(en.units.epa.cmc);
    expect(await epa.textContent()).toContain('not limits for fish culture');

    await page.getByRole('button', { name: en.units.range.long['7d'] }).click();
    await page.waitForURL(/range=7d/);
    await expect.poll(() => page.getByRole('button', { name: en.units.range.long['7d'] }).getAttribute('aria-pressed')).toBe('true');
    await page.getByTestId('chart-ph').locator('canvas').waitFor();

    expect(seen.offLoopback).toEqual([]);
    expect(seen.errors).toEqual([]);
    await page.close();
  });
});
