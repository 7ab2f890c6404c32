import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { startTestApp, type TestApp } from '../setup/test-app';
import { launchBrowser, signIn, viewports, watch, type TestBrowser } from './browser';

describe('the night round in a real browser', () => {
  let app: TestApp;
  let baseUrl: string;
  let browser: TestBrowser;
  let farmId: string;
  let p2: string;

  beforeAll(async () => {
    app = await startTestApp({ serveClient: true, worker: true });
    const seed = await seedDemoFarms(app.ds);
    if (!app.baseUrl) throw new Error('no base URL');
    baseUrl = app.baseUrl;
    farmId = seed.farms['harrow-bend']!;
    p2 = seed.units['harrow-bend:P2']!;
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('a hand walks the ponds in order and logs DO, temperature and "aerator on" in a few taps', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.phone);
    const seen = watch(page);
    await signIn(page, baseUrl, 'hand');
    await page.goto(`${baseUrl}/farms/${farmId}/night-round`, { waitUntil: 'load' });
    await page.getByTestId('night-round').waitFor();

    // Ponds only, in walking order (P1…P6, then the shrimp ponds), once the units have loaded.
    await page.locator('[data-night-unit]').first().waitFor();
    const codes = await page
      .locator('[data-night-unit]')
      .evaluateAll((els) => els.map((el) => (el as unknown as { getAttribute(n: string): string | null }).getAttribute('data-night-unit')));
    expect(codes).toEqual(['P1', 'P2', 'P3', 'P4', 'P5', 'P6', 'S1', 'S2']);

    const card = page.locator('[data-night-unit="P2"]');
    await card.getByLabel(en.nightRound.doLabel).fill('3,8');
    await card.getByLabel(en.nightRound.tempLabel).fill('27.5');
    await card.getByRole('button', { name: en.nightRound.aeratorOn }).click();
    expect(await card.getByRole('button', { name: en.nightRound.aeratorOn }).getAttribute('aria-pressed')).toBe('true');
    await card.getByRole('button', { name: 'Save P2' }).click();
    await card.getByTestId('night-send-state').and(page.locator('[data-state="sent"]')).waitFor({ timeout: 15_000 });

    const rows = (await app.ds.query(
      `SELECT analyte, value, source, aerator_on AS "aeratorOn", method, basis FROM water_tests
       WHERE unit_id = $1 AND source = 'night_round' ORDER BY analyte`,
      [p2],
    )) as Array<{ analyte: string; value: number; source: string; aeratorOn: boolean; method: string; basis: string }>;
    expect(rows).toEqual([
      { analyte: 'dissolved_oxygen', value: 3.8, source: 'night_round', aeratorOn: true, method: 'meter', basis: 'mg-l' },
      { analyte: 'temperature', value: 27.5, source: 'night_round', aeratorOn: true, method: 'meter', basis: 'c' },
    ]);
    expect(await page.getByTestId('night-progress').textContent()).toBe('1 of 8 done tonight');

    // The next visit shows tonight's reading as the last one for comparison.
    await page.reload({ waitUntil: 'load' });
    await page.locator('[data-night-unit="P2"]').getByRole('button', { name: en.nightRound.again }).click();
    await page.locator('[data-night-unit="P2"]').getByTestId('last-reading').filter({ hasText: 'DO 3.8 mg/L' }).waitFor();
    expect(seen.errors).toEqual([]);
    await page.close();
  });
});
