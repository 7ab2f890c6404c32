// The planner's day in a real browser: accept one recommendation, override another with a note, and
// the hands' ration sheet (what a hand's GET /rations answers) carries both decisions.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import { rationSheetSchema } from '../../shared/schemas/feed.schema';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { insertReadings, probeOf } from '../factories/readings';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';
import { launchBrowser, signIn, viewports, watch, type TestBrowser } from './browser';

describe('rations in a real browser', () => {
  let app: TestApp;
  let baseUrl: string;
  let farmId: string;
  let browser: TestBrowser;

  beforeAll(async () => {
    app = await startTestApp({ serveClient: true, worker: true });
    const seed = await seedDemoFarms(app.ds);
    farmId = seed.farms['harrow-bend']!;
    // A day of steady probe readings in P1 and P2, so the feeding tables have a water temperature to plan from.
    for (const code of ['P1', 'P2']) {
      const probeId = await probeOf(app.ds, seed.units[`harrow-bend:${code}`]!);
      const rows = [];
      for (let m = 26 * 60; m >= 5; m -= 15) {
        const at = new Date(Date.now() - m * 60_000);
        for (const [quantity, value] of Object.entries({ water_temperature: 26, ph: 7.6, dissolved_oxygen: 7.2 }))
          rows.push({ probeId, quantity, at, value });
      }
      await insertReadings(app.ds, rows);
    }
    // As `npm run db:seed` does: the seeded kit results go to the worker, which then works out the day's recommendations.
    for (const id of seed.waterTestIds)
      await app.queues.add('computeWaterTest', { farmId, waterTestId: id, version: 1 }, { jobId: `wt:${id}:1` });
    await app.drain({ queues: ['results', 'feed'], timeoutMs: 60_000 });
    if (!app.baseUrl) throw new Error('no base URL');
    baseUrl = app.baseUrl;
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('the planner accepts one recommendation and overrides another with a note; the hands’ sheet shows both', async () => {
    const page = await browser.newPage(viewports.desktop);
    const seen = watch(page);
    await signIn(page, baseUrl, 'planner');
    // The planner lands on Rations.
    await page.waitForURL(/\/rations$/);
    await page.getByTestId('ration-row').first().waitFor();

    const p1 = page.locator('[data-testid="ration-row"][data-unit-code="P1"]');
    const p2 = page.locator('[data-testid="ration-row"][data-unit-code="P2"]');
    expect(await p1.getAttribute('data-status')).toBe('pending');
    expect(await p2.getAttribute('data-status')).toBe('pending');
    // P2's latest Nessler result came two days after a formalin bath: the rule cuts and says it may read high.
    expect(await p2.locator('[data-action]').getAttribute('data-action')).toBe('cut');
    expect(await p2.getByTestId('reason-list').textContent()).toContain('May read high');
    // The caution is on the screen.
    expect(await page.getByTestId('rations').textContent()).toContain(en.rations.caution);

    const p1Button = p1.getByRole('button', { name: /^Accept .* kg$/ });
    const p1Label = (await p1Button.textContent()) ?? '';
    await p1Button.click();
    await expect.poll(() => p1.getAttribute('data-status')).toBe('accepted');

    // Override P2: first without a note (refused beside the field), then with one.
    await p2.getByRole('button', { name: en.rations.overrideButton }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel(en.rations.override.amount).fill('150');
    await dialog.getByRole('button', { name: en.rations.override.submit }).click();
    await expect.poll(() => dialog.getByText(en.rations.override.noteRequired).isVisible()).toBe(true);
    const note = 'Salicylate retest read 0.03 mg/L NH3; feed 150 kg';
    await dialog.getByLabel(en.rations.override.note).fill(note);
    await dialog.getByRole('button', { name: en.rations.override.submit }).click();
    await expect.poll(() => p2.getAttribute('data-status')).toBe('overridden');
    expect(await p2.getByTestId('override-note').textContent()).toBe(note);

    // The printable sheet shows what to feed.
    await page.getByRole('tab', { name: en.rations.view.sheet }).click();
    const sheet = page.getByTestId('ration-sheet');
    await sheet.waitFor();
    const p1Kg = p1Label.replace(/^Accept /, '');
    expect(await sheet.locator('[data-testid="sheet-row"][data-unit-code="P1"] [data-testid="sheet-to-feed"]').textContent()).toBe(p1Kg);
    expect(await sheet.locator('[data-testid="sheet-row"][data-unit-code="P2"] [data-testid="sheet-to-feed"]').textContent()).toBe(
      '150.0 kg',
    );
    expect(await sheet.locator('[data-testid="sheet-row"][data-unit-code="P2"]').textContent()).toContain(note);
    expect(await sheet.locator('[data-testid="sheet-row"][data-unit-code="P3"] [data-testid="sheet-to-feed"]').textContent()).toBe(
      en.rations.sheet.notDecided,
    );

    // What a hand gets from the API: P1 at the recommended amount, P2 at the planner's amount with the note.
    const hand = await signedIn(app.app, demoEmail('hand'));
    const res = await hand.get(`/api/farms/${farmId}/rations`);
    expect(res.status).toBe(200);
    const handSheet = rationSheetSchema.parse(res.body);
    const r1 = handSheet.rows.find((r) => r.unit.code === 'P1')!;
    const r2 = handSheet.rows.find((r) => r.unit.code === 'P2')!;
    expect(r1.status).toBe('accepted');
    expect(r1.toFeedKg).toBe(r1.recommendedKg);
    expect(r1.toFeedKg!).toBeGreaterThan(0);
    expect(`${r1.toFeedKg!.toFixed(1)} kg`).toBe(p1Kg);
    expect(r2.status).toBe('overridden');
    expect(r2.toFeedKg).toBe(150);
    expect(r2.recommendation?.overrideNote).toBe(note);
    expect(handSheet.rows.find((r) => r.unit.code === 'P3')!.toFeedKg).toBeNull();

    expect(seen.offLoopback).toEqual([]);
    expect(seen.errors).toEqual([]);
    await page.close();
  });

  it('a planner accepts the rest together, and the print view leaves the menus out', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.phone);
    await signIn(page, baseUrl, 'planner');
    await page.getByTestId('ration-row').first().waitFor();
    const pending = await page.locator('[data-testid="ration-row"][data-status="pending"]').count();
    expect(pending).toBeGreaterThan(0);
    await page.getByTestId('bulk-bar').getByRole('button').first().click();
    await page
      .getByRole('dialog')
      .getByRole('button', { name: `Accept ${pending}` })
      .click();
    await expect.poll(() => page.locator('[data-testid="ration-row"][data-status="pending"]').count()).toBe(0);

    await page.getByRole('tab', { name: en.rations.view.sheet }).click();
    await page.getByTestId('ration-sheet').waitFor();
    await page.emulateMedia({ media: 'print' });
    expect(await page.getByTestId('tab-bar').isVisible()).toBe(false);
    expect(await page.getByRole('button', { name: en.rations.sheet.print }).isVisible()).toBe(false);
    expect(await page.getByTestId('ration-sheet').isVisible()).toBe(true);
    await page.close();
  });
});
