// Screenshots of the crew screens for docs/screenshots (390×844 phone, 1280×800 desktop).
// Runs only when asked: GILLWISE_SCREENSHOTS=1 npx vitest run --project e2e tests/e2e/pondside-screenshots.e2e.test.ts
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, it } from 'vitest';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { insertReadings, probeOf, type ReadingSpec } from '../factories/readings';
import { startTestApp, type TestApp } from '../setup/test-app';
import { launchBrowser, signIn, viewports, type TestBrowser } from './browser';

const OUT = path.resolve(import.meta.dirname, '../../docs/screenshots');
const HOUR = 3600_000;
const wanted = Boolean(process.env.GILLWISE_SCREENSHOTS);

/** A diurnal pond: pH low at dawn, highest mid-afternoon; temperature a little behind it (invented). */
function pondDay(probeId: string, hours: number, base: { ph: number; t: number; doMgL: number }): ReadingSpec[] {
  const rows: ReadingSpec[] = [];
  const now = Date.now();
  for (let h = hours; h >= -0.1; h -= 0.1) {
    const at = new Date(now - h * HOUR);
    const local = (at.getUTCHours() - 6 + 24) % 24; // America/Chicago in winter
    const wave = Math.sin(((local - 9) / 24) * 2 * Math.PI);
    rows.push({ probeId, quantity: 'ph', at, value: Math.round((base.ph + 0.45 * wave) * 100) / 100 });
    rows.push({ probeId, quantity: 'water_temperature', at, value: Math.round((base.t + 1.6 * wave) * 10) / 10 });
    rows.push({ probeId, quantity: 'dissolved_oxygen', at, value: Math.round((base.doMgL + 2.2 * wave) * 10) / 10 });
  }
  return rows;
}

async function shoot(page: Page, name: string) {
  await page.waitForTimeout(400);
  await page.screenshot({ path: path.join(OUT, `${name}.png`) });
  await page.screenshot({ path: path.join('/tmp/gillwise-shots', `${name}-full.png`), fullPage: true });
}

describe.skipIf(!wanted)('screenshots of the crew screens', () => {
  let app: TestApp;
  let baseUrl: string;
  let browser: TestBrowser;
  let farmId: string;
  let units: Record<string, string>;

  beforeAll(async () => {
    mkdirSync(OUT, { recursive: true });
    mkdirSync('/tmp/gillwise-shots', { recursive: true });
    app = await startTestApp({ serveClient: true, worker: true });
    const seed = await seedDemoFarms(app.ds);
    baseUrl = app.baseUrl!;
    farmId = seed.farms['harrow-bend']!;
    units = Object.fromEntries(Object.entries(seed.units).map(([k, v]) => [k.replace('harrow-bend:', ''), v]));
    const bases: Record<string, { ph: number; t: number; doMgL: number }> = {
      P1: { ph: 8.0, t: 27, doMgL: 6.5 },
      P2: { ph: 8.2, t: 28, doMgL: 5.2 },
      P3: { ph: 7.9, t: 27.5, doMgL: 6.8 },
      P4: { ph: 8.3, t: 29, doMgL: 4.1 },
      P5: { ph: 8.1, t: 29.5, doMgL: 5.9 },
      P6: { ph: 8.0, t: 28.5, doMgL: 6.1 },
      S1: { ph: 8.1, t: 29, doMgL: 5.5 },
      S2: { ph: 8.0, t: 28.5, doMgL: 5.8 },
    };
    for (const [code, base] of Object.entries(bases)) {
      await insertReadings(app.ds, pondDay(await probeOf(app.ds, units[code]!), 72, base));
    }
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('takes them', async () => {
    for (const [vp, size] of [
      ['phone', viewports.phone],
      ['desktop', viewports.desktop],
    ] as const) {
      await browser.context.clearCookies();
      const page = await browser.newPage(size);
      await signIn(page, baseUrl, 'hand');
      await page.getByTestId('task-board').waitFor();
      await page
        .getByTestId('ration-sheet')
        .waitFor({ timeout: 10_000 })
        .catch(() => undefined);
      await shoot(page, `tasks-${vp}`);

      // Pondside: P1 with a salicylate reading of 1 mg/L; instant result.
      await page.goto(`${baseUrl}/farms/${farmId}/units/${units.P1}/test`, { waitUntil: 'load' });
      await page.getByTestId('probe-now').waitFor();
      await page.getByRole('group', { name: en.pondside.reading.steps }).getByRole('button', { name: '1', exact: true }).click();
      await page.getByTestId('instant-result').waitFor();
      await shoot(page, `pondside-form-${vp}`);
      await page.getByTestId('instant-result').scrollIntoViewIfNeeded();
      await shoot(page, `pondside-instant-${vp}`);
      await page.getByTestId('save-test').click();
      await page.getByTestId('stored-result').waitFor({ timeout: 30_000 });
      await page.evaluate(() => window.scrollTo(0, 0));
      await shoot(page, `pondside-result-${vp}`);
      await page.getByTestId('stored-provenance').scrollIntoViewIfNeeded();
      await shoot(page, `pondside-provenance-${vp}`);

      // Nessler on P2 after a formalin bath: the warnings before saving.
      if (vp === 'phone') {
        await page.request.post(`${baseUrl}/api/farms/${farmId}/units/${units.P2}/treatments`, {
          headers: { 'x-gillwise-client': 'web' },
          data: {
            product: 'formalin',
            dose: 25,
            doseUnit: 'mg/L',
            startsAt: new Date(Date.now() - 20 * HOUR).toISOString(),
            withdrawalDays: 3,
          },
        });
      }
      await page.getByRole('button', { name: en.pondside.result.another }).click();
      await page.getByRole('button', { name: /Show all/ }).click();
      await page.locator('[data-unit-code="P2"]').click();
      await page.locator('label:has(input[name="method"][value="nessler"])').click();
      await page.getByText(en.pondside.nessler.recentTitle).waitFor();
      await page.getByRole('heading', { name: en.pondside.kit.title }).scrollIntoViewIfNeeded();
      await shoot(page, `pondside-nessler-${vp}`);

      // Offline: saved on the phone, waiting to send.
      await browser.context.setOffline(true);
      await page.locator('label:has(input[name="method"][value="salicylate"])').click();
      await page.getByRole('group', { name: en.pondside.reading.steps }).getByRole('button', { name: '0.5', exact: true }).click();
      await page.getByTestId('save-test').click();
      await page.getByTestId('send-state').waitFor();
      await page.evaluate(() => window.scrollTo(0, 0));
      await shoot(page, `pondside-offline-${vp}`);
      await browser.context.setOffline(false);
      await page.getByTestId('stored-result').waitFor({ timeout: 30_000 });

      await page.evaluate(() => localStorage.clear());
      await page.goto(`${baseUrl}/farms/${farmId}/night-round`, { waitUntil: 'load' });
      await page.locator('[data-night-unit="P1"]').getByTestId('probe-now').filter({ hasText: 'DO' }).waitFor();
      const p1 = page.locator('[data-night-unit="P1"]');
      await p1.getByLabel(en.nightRound.doLabel).fill('5.4');
      await p1.getByLabel(en.nightRound.tempLabel).fill('27.2');
      await p1.getByRole('button', { name: 'Save P1' }).click();
      const p2 = page.locator('[data-night-unit="P2"]');
      await p2.getByLabel(en.nightRound.doLabel).fill('3.1');
      await p2.getByRole('button', { name: en.nightRound.aeratorOn }).click();
      await shoot(page, `night-round-${vp}`);

      await page.goto(`${baseUrl}/farms/${farmId}/treatments`, { waitUntil: 'load' });
      await page.getByTestId('treatments').waitFor();
      if (vp === 'phone') {
        await page.getByLabel(en.treatments.unit, { exact: true }).selectOption({ label: 'P4 · Pond 4 — Long Reach' });
        await page.locator('label:has(input[name="product"][value="salt"])').click();
        await page.getByLabel(en.treatments.dose, { exact: true }).fill('3');
        await page.getByLabel(en.treatments.doseUnit).selectOption('g/L');
        await page.getByRole('button', { name: en.treatments.submit }).click();
        await page.getByText(en.treatments.savedTitle).waitFor();
        await page.getByLabel(en.treatments.unit, { exact: true }).selectOption({ label: 'R2 · Raceway 2' });
        await page.locator('label:has(input[name="product"][value="copper"])').click();
        await page.getByLabel(en.treatments.dose, { exact: true }).fill('0.2');
        await page.locator('label:has(input[name="withdrawalBasis"][value="degree_days"])').click();
        await page.getByLabel(en.treatments.withdrawalDegreeDays).fill('500');
        await page.getByRole('button', { name: en.treatments.submit }).click();
        await page.getByText(en.treatments.savedTitle).waitFor();
      }
      await page.evaluate(() => window.scrollTo(0, 0));
      await shoot(page, `treatments-${vp}`);
      await page.getByRole('heading', { name: en.treatments.listTitle }).scrollIntoViewIfNeeded();
      await shoot(page, `treatments-list-${vp}`);

      await page.goto(`${baseUrl}/farms/${farmId}/observations`, { waitUntil: 'load' });
      await page.getByTestId('observations').waitFor();
      await page.getByLabel(en.observations.unit, { exact: true }).selectOption({ label: 'P4 · Pond 4 — Long Reach' });
      await page.locator('label:has(input[name="kind"][value="dead_fish"])').click();
      await page.getByLabel(en.observations.count).fill('14');
      await page.getByText(en.observations.dieOffTitle).waitFor();
      await page
        .getByRole('heading', { name: en.observations.kindLabel })
        .scrollIntoViewIfNeeded()
        .catch(() => undefined);
      await shoot(page, `observations-${vp}`);
      await page.getByRole('button', { name: en.observations.submit }).click();
      await page.getByTestId('observation-sent').waitFor({ timeout: 15_000 });
      await page.evaluate(() => window.scrollTo(0, 0));
      await shoot(page, `observations-saved-${vp}`);

      await page.goto(`${baseUrl}/farms/${farmId}/units/${units.P1}/label`, { waitUntil: 'load' });
      await page.getByTestId('label-qr').first().waitFor();
      await shoot(page, `pondside-label-${vp}`);
      if (vp === 'desktop') {
        await page.getByLabel(en.pondside.label.copies).selectOption('4');
        await page.emulateMedia({ media: 'print' });
        await shoot(page, 'pondside-label-print-desktop');
        await page.emulateMedia({ media: 'screen' });
      }
      await page.close();
    }

    // Spanish, phone: the form and the result.
    await browser.context.clearCookies();
    const es = await browser.newPage(viewports.phone);
    await signIn(es, baseUrl, 'hand');
    await es.getByRole('button', { name: 'Español' }).click();
    await es.goto(`${baseUrl}/farms/${farmId}/units/${units.P3}/test`, { waitUntil: 'load' });
    await es.getByTestId('probe-now').waitFor();
    await es.getByRole('button', { name: '2', exact: true }).click();
    await shoot(es, 'pondside-es-form-phone');
    await es.getByTestId('save-test').click();
    await es.getByTestId('stored-result').waitFor({ timeout: 30_000 });
    await es.evaluate(() => window.scrollTo(0, 0));
    await shoot(es, 'pondside-es-result-phone');
    await es.goto(`${baseUrl}/farms/${farmId}/tasks`, { waitUntil: 'load' });
    await es.getByTestId('task-board').waitFor();
    await shoot(es, 'tasks-es-phone');
    await es.close();
  });
});
