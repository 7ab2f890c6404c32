import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { startTestApp, type TestApp } from '../setup/test-app';
import { launchBrowser, signIn, viewports, type TestBrowser } from './browser';

async function countTests(app: TestApp, unitId: string, since: Date): Promise<number> {
  const rows = (await app.ds.query('SELECT count(*)::int AS n FROM water_tests WHERE unit_id = $1 AND created_at >= $2', [
    unitId,
    since.toISOString(),
  ])) as Array<{ n: number }>;
  return rows[0]?.n ?? 0;
}

describe('pondside entries made without signal', () => {
  let app: TestApp;
  let baseUrl: string;
  let browser: TestBrowser;
  let farmId: string;
  let p3: string;

  beforeAll(async () => {
    app = await startTestApp({ serveClient: true, worker: true });
    const seed = await seedDemoFarms(app.ds);
    if (!app.baseUrl) throw new Error('no base URL');
    baseUrl = app.baseUrl;
    farmId = seed.farms['harrow-bend']!;
    p3 = seed.units['harrow-bend:P3']!;
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('are kept on the phone while offline and sent once when the connection comes back', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.phone);
    await signIn(page, baseUrl, 'hand');
    await page.goto(`${baseUrl}/farms/${farmId}/units/${p3}/test`, { waitUntil: 'load' });
    await page.getByTestId('chosen-unit').waitFor();
    const since = new Date(Date.now() - 1000);

    await browser.context.setOffline(true);
    await page.getByRole('group', { name: en.pondside.reading.steps }).getByRole('button', { name: '0.5', exact: true }).click();
    await page.getByLabel(en.pondside.water.ph).fill('8.2');
    await page.getByLabel(en.pondside.water.temperature).fill('26');
    await page.getByTestId('save-test').click();

    const state = page.getByTestId('send-state');
    await state.waitFor();
    expect(await state.getAttribute('data-state')).toBe('waiting');
    // The phone's own result is there without the server.
    await page.getByTestId('instant-result-value').waitFor();
    const queued = await page.evaluate(
      () =>
        new Promise<number>((resolve, reject) => {
          const req = indexedDB.open('gillwise-outbox');
          req.onsuccess = () => {
            const tx = req.result.transaction('entries', 'readonly').objectStore('entries').count();
            tx.onsuccess = () => resolve(tx.result);
            tx.onerror = () => reject(tx.error);
          };
          req.onerror = () => reject(req.error);
        }),
    );
    expect(queued).toBe(1);
    // Give a retry time to happen: nothing can reach the server.
    await page.waitForTimeout(1500);
    expect(await countTests(app, p3, since)).toBe(0);

    await browser.context.setOffline(false);
    await page.getByTestId('stored-result-value').waitFor({ timeout: 30_000 });
    expect(await countTests(app, p3, since)).toBe(1);

    // Whatever else happens (a reload, the app coming to the front again), it is stored once.
    await page.reload({ waitUntil: 'load' });
    await page.getByTestId('test-result').waitFor();
    await page.waitForTimeout(1000);
    expect(await countTests(app, p3, since)).toBe(1);
    const res = await page.request.get(`${baseUrl}/api/farms/${farmId}/units/${p3}/tests?analyte=total_ammonia&limit=10`);
    const { tests } = (await res.json()) as { tests: Array<{ createdAt: string; handheldPh: number | null }> };
    const fresh = tests.filter((x) => Date.parse(x.createdAt) >= since.getTime());
    expect(fresh).toHaveLength(1);
    expect(fresh[0]?.handheldPh).toBe(8.2);
    await page.close();
  });

  it('keeps what was typed across a reload, and a resend of the same client id stores once', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.phone);
    await signIn(page, baseUrl, 'hand');
    await page.goto(`${baseUrl}/farms/${farmId}/units/${p3}/test`, { waitUntil: 'load' });
    await page.getByTestId('chosen-unit').waitFor();
    const reading = page.getByLabel(/reading/);
    await reading.fill('0,75');
    await page.getByLabel(en.pondside.more.note).fill('green water, fish active');
    await page.reload({ waitUntil: 'load' });
    await page.getByTestId('chosen-unit').waitFor();
    expect(await page.getByLabel(/reading/).inputValue()).toBe('0,75');
    expect(await page.getByLabel(en.pondside.more.note).inputValue()).toBe('green water, fish active');

    const clientId = crypto.randomUUID();
    const body = { clientId, analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: 0.75, source: 'pondside' };
    const headers = { 'x-gillwise-client': 'web' };
    const first = await page.request.post(`${baseUrl}/api/farms/${farmId}/units/${p3}/tests`, { data: body, headers });
    const second = await page.request.post(`${baseUrl}/api/farms/${farmId}/units/${p3}/tests`, { data: body, headers });
    expect([first.status(), second.status()]).toEqual([201, 200]);
    const rows = (await app.ds.query('SELECT count(*)::int AS n FROM water_tests WHERE client_id = $1', [clientId])) as Array<{
      n: number;
    }>;
    expect(rows[0]?.n).toBe(1);
    await page.close();
  });
});
