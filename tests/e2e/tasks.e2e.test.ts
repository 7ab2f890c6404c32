import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { startTestApp, type TestApp } from '../setup/test-app';
import { launchBrowser, signIn, viewports, watch, type TestBrowser } from './browser';

describe('the hand’s tasks in a real browser', () => {
  let app: TestApp;
  let baseUrl: string;
  let browser: TestBrowser;
  let farmId: string;

  beforeAll(async () => {
    app = await startTestApp({ serveClient: true, worker: true });
    const seed = await seedDemoFarms(app.ds);
    if (!app.baseUrl) throw new Error('no base URL');
    baseUrl = app.baseUrl;
    farmId = seed.farms['harrow-bend']!;
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('a hand lands on today’s tests, overdue first with shape and word, and a tap opens the pondside form for that unit', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.phone);
    const seen = watch(page);
    await signIn(page, baseUrl, 'hand');
    expect(new URL(page.url()).pathname).toBe(`/farms/${farmId}/tasks`);
    await page.getByTestId('task-board').waitFor();

    const api = await page.request.get(`${baseUrl}/api/farms/${farmId}/tasks`);
    const { tests } = (await api.json()) as { tests: Array<{ code: string; status: string; unitId: string }> };
    const due = tests.filter((x) => x.status !== 'upcoming');
    expect(due.length).toBeGreaterThan(0);

    const cards = page.locator('[data-task-unit]');
    await cards.first().waitFor();
    const shown = await cards.evaluateAll((els) =>
      els.map((el) => (el as unknown as { getAttribute(n: string): string | null }).getAttribute('data-task-unit')),
    );
    expect(shown).toEqual(due.map((x) => x.code));
    const first = due[0]!;
    const firstCard = cards.first();
    const text = await firstCard.textContent();
    expect(text).toContain(first.status === 'overdue' ? '◆' : '▲');
    expect(text).toMatch(first.status === 'overdue' ? /Overdue/ : /Due today/);

    await firstCard.click();
    await page.waitForURL(new RegExp(`/farms/${farmId}/units/${first.unitId}/test$`));
    expect(await page.getByTestId('chosen-unit').textContent()).toContain(first.code);

    // The ration sheet of today is on the same page.
    await page.goto(`${baseUrl}/farms/${farmId}/tasks`, { waitUntil: 'load' });
    await page.getByTestId('ration-sheet').waitFor();
    expect(await page.getByRole('heading', { name: en.tasks.rations.title }).isVisible()).toBe(true);
    expect(seen.offLoopback).toEqual([]);
    expect(seen.errors).toEqual([]);
    await page.close();
  });
});
