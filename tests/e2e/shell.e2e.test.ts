import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { homePathFor, navFor, splitForTabBar } from '../../src/app/nav';
import en from '../../src/locales/en.json';
import { seedDemoFarms } from '../factories/demo';
import { startTestApp, type TestApp } from '../setup/test-app';
import { launchBrowser, navKeys, signIn, viewports, watch, type DemoRole, type TestBrowser } from './browser';

const roles: DemoRole[] = ['hand', 'manager', 'planner', 'admin'];

describe('the app shell in a real browser', () => {
  let app: TestApp;
  let baseUrl: string;
  let browser: TestBrowser;

  beforeAll(async () => {
    app = await startTestApp({ serveClient: true });
    await seedDemoFarms(app.ds);
    if (!app.baseUrl) throw new Error('startTestApp({ serveClient: true }) gave no base URL');
    baseUrl = app.baseUrl;
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  for (const role of roles) {
    it(`${role === 'admin' ? 'an' : 'a'} ${role} signs in, lands on their own home and sees only their own navigation`, async () => {
      await browser.context.clearCookies();
      const page = await browser.newPage(viewports.desktop);
      const seen = watch(page);
      await signIn(page, baseUrl, role);
      // Each role lands on its own first screen (tasks, map, rations), then its home is one tap away.
      const landing = new RegExp(`${homePathFor(role, 'FARM').replace('FARM', '[0-9a-f-]{36}')}$`);
      await page.waitForURL(landing);
      const farmPath = new URL(page.url()).pathname.split('/').slice(0, 3).join('/');
      await page.goto(`${baseUrl}${farmPath}`, { waitUntil: 'load' });

      const home = page.getByTestId(`home-${role}`);
      await home.waitFor();
      expect(await home.getByTestId('who-role').textContent()).toBe(en.roles[role]);
      expect(await home.getByTestId('who-farm').textContent()).toBeTruthy();
      expect(await home.textContent()).toContain(en.cautions.thresholds);

      const expected = navFor(role).map((e) => e.key);
      expect(await navKeys(page, 'side-nav')).toEqual(expected);

      await page.setViewportSize(viewports.phone);
      expect(await navKeys(page, 'tab-bar')).toEqual(splitForTabBar(navFor(role), 4).tabs.map((e) => e.key));
      expect(await page.getByTestId('tab-bar').getByRole('button', { name: en.nav.more }).isVisible()).toBe(true);

      expect(seen.offLoopback).toEqual([]);
      expect(seen.errors).toEqual([]);
      await page.close();
    });
  }

  it('a wrong password shows the server’s answer and stays on sign-in', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.phone);
    const seen = watch(page);
    await signIn(page, baseUrl, 'hand', 'not-the-password');
    await expect.poll(() => page.getByRole('alert').textContent()).toContain(en.signIn.invalidCredentials);
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(seen.offLoopback).toEqual([]);
    await page.close();
  });

  it('a deep link while signed out goes through sign-in and back to the page', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.desktop);
    await signIn(page, baseUrl, 'manager');
    const farmHome = new URL(page.url()).pathname;
    await browser.context.clearCookies();

    await page.goto(`${baseUrl}${farmHome}`, { waitUntil: 'load' });
    await page.waitForURL(/\/sign-in\?next=/);
    await signIn(page, baseUrl, 'manager');
    expect(new URL(page.url()).pathname).toBe(farmHome);
    await page.close();
  });

  it('signing out ends the session: the farm page asks to sign in again', async () => {
    await browser.context.clearCookies();
    const page = await browser.newPage(viewports.desktop);
    await signIn(page, baseUrl, 'planner');
    const farmHome = new URL(page.url()).pathname;
    await page.getByRole('button', { name: en.shell.signOut }).click();
    await page.waitForURL(/\/sign-in$/);
    await page.goto(`${baseUrl}${farmHome}`, { waitUntil: 'load' });
    await page.waitForURL(/\/sign-in\?next=/);
    await page.close();
  });
});
