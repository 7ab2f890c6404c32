// A planner imports a lab CSV in a real browser: a spreadsheet is refused with the way out, the columns
// are mapped over a preview, rejected rows are listed with the reason, and the good rows are stored.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { startTestApp, type TestApp } from '../setup/test-app';
import { launchBrowser, signIn, viewports, watch, type TestBrowser } from './browser';

describe('imports in a real browser', () => {
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

  it('refuses a spreadsheet, lists the rejected rows of a CSV with their reasons, and stores the good ones', async () => {
    const page = await browser.newPage(viewports.desktop);
    const seen = watch(page);
    await signIn(page, baseUrl, 'planner');
    await page.goto(`${baseUrl}/farms/${farmId}/imports`, { waitUntil: 'load' });
    const file = page.getByTestId('import-file');
    await page.getByTestId('upload-card').waitFor();

    await file.setInputFiles({
      name: 'june-results.xlsx',
      mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
      buffer: Buffer.from('PK\u0003\u0004'),
    });
    await page.getByText(en.imports.upload.sheetTitle).waitFor();

    await file.setInputFiles('tests/fixtures/csv/lab-results-bad-rows.csv');
    const mapping = page.getByTestId('mapping');
    await mapping.waitFor();
    // The preview marks the columns in use.
    expect(await page.getByTestId('import-preview').textContent()).toContain('unit_code');
    await mapping.getByRole('button', { name: /^Check all \d+ rows$/ }).click();

    const report = page.getByTestId('import-report');
    await report.getByTestId('rejects').waitFor();
    const rejects = report.getByTestId('rejects');
    expect(await rejects.locator('[data-line="3"]').textContent()).toContain('"P9" is not a unit of this farm');
    expect(await rejects.locator('[data-line="4"]').textContent()).toContain('is not a number');

    const commit = page.getByTestId('import-commit');
    const store = commit.getByRole('button', { name: /^Store \d+ rows?$/ });
    expect(await store.isDisabled()).toBe(true);
    await commit.getByRole('checkbox').check();
    await store.click();
    await expect.poll(() => page.getByTestId('import-session').getAttribute('data-state'), { timeout: 20_000 }).toBe('committed');
    const stored = Number(
      ((await app.ds.query("SELECT count(*)::int AS n FROM water_tests WHERE source = 'import'")) as Array<{ n: number }>)[0]?.n ?? 0,
    );
    expect(await commit.textContent()).toContain(`${stored} row`);
    expect(stored).toBeGreaterThan(0);

    expect(seen.offLoopback).toEqual([]);
    // The refused spreadsheet never reached the server; nothing else failed.
    expect(seen.errors).toEqual([]);
    await page.close();
  });
});
