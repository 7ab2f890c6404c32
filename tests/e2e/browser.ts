// Headless Chromium for browser tests: Debian's /usr/bin/chromium through playwright-core, a fresh
// profile per launch, no calls home. Helpers to sign in as a demo role and to watch the network.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export type DemoRole = 'hand' | 'manager' | 'planner' | 'admin';

export const DEMO_PASSWORD = 'gillwise-demo';
export const demoEmail = (role: DemoRole) => `${role}@harrowbend.example`;

export const CHROMIUM_PATH = process.env.GILLWISE_CHROMIUM ?? '/usr/bin/chromium';
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export const viewports = {
  phone: { width: 390, height: 844 },
  desktop: { width: 1280, height: 800 },
} as const;

export interface TestBrowser {
  context: BrowserContext;
  /** A new tab; its requests and console errors are recorded in `watch(page)`. */
  newPage(viewport?: { width: number; height: number }): Promise<Page>;
  close(): Promise<void>;
}

export async function launchBrowser(options: { locale?: string } = {}): Promise<TestBrowser> {
  const profile = mkdtempSync(path.join(tmpdir(), 'gillwise-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: CHROMIUM_ARGS,
    locale: options.locale ?? 'en-US',
    viewport: viewports.desktop,
  });
  return {
    context,
    async newPage(viewport) {
      const page = await context.newPage();
      if (viewport) await page.setViewportSize(viewport);
      return page;
    },
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

export interface PageWatch {
  /** Every request whose URL is not on 127.0.0.1 (or data:/blob:). Should stay empty. */
  offLoopback: string[];
  /** Console errors and uncaught page errors, minus the expected 401 of GET /api/me when signed out. */
  errors: string[];
}

export function watch(page: Page): PageWatch {
  const result: PageWatch = { offLoopback: [], errors: [] };
  page.on('request', (r) => {
    if (!/^(https?:\/\/127\.0\.0\.1(:\d+)?\/|data:|blob:)/.test(r.url())) result.offLoopback.push(r.url());
  });
  page.on('console', (m) => {
    if (m.type() !== 'error') return;
    // Chromium logs every non-2xx answer; a signed-out GET /api/me answering 401 is the normal case.
    if (/status of 401/.test(m.text())) return;
    result.errors.push(m.text());
  });
  page.on('pageerror', (e) => result.errors.push(`pageerror: ${e.message}`));
  return result;
}

/**
 * Sign in through the real form as a demo user and wait for the farm shell. Fields are found by
 * their autocomplete role, so it works in either language.
 */
export async function signIn(page: Page, baseUrl: string, role: DemoRole, password = DEMO_PASSWORD): Promise<void> {
  if (!page.url().includes('/sign-in')) await page.goto(`${baseUrl}/sign-in`, { waitUntil: 'load' });
  await page.locator('input[autocomplete="username"]').fill(demoEmail(role));
  await page.locator('input[autocomplete="current-password"]').fill(password);
  await page.locator('input[autocomplete="current-password"]').press('Enter');
  if (password === DEMO_PASSWORD) await page.waitForURL(/\/farms\/[^/]+/, { timeout: 15_000 });
}

/** The data-nav-key of every link in a navigation region, in order. */
export async function navKeys(page: Page, testId: 'side-nav' | 'tab-bar' | 'more-nav'): Promise<string[]> {
  return page
    .getByTestId(testId)
    .locator('[data-nav-key]')
    .evaluateAll((els) =>
      // tsconfig.json (node side) has no DOM lib, hence the narrow cast.
      els.map((el) => (el as unknown as { getAttribute(name: string): string | null }).getAttribute('data-nav-key') ?? ''),
    );
}
