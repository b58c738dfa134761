/**
 * Browser helpers for the end-to-end suites: Debian Chromium through playwright-core (no
 * browser download), a page that records console errors (CSP violations included) and any
 * request to a host outside loopback, and sign-in as a demo user.
 */
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';

export const DEMO_PASSWORD = 'flueledger-demo';
export const baseUrl = (): string => {
  const url = process.env.FL_E2E_URL;
  if (!url) throw new Error('FL_E2E_URL is not set (global setup did not run)');
  return url;
};

export interface WatchedPage {
  page: Page;
  context: BrowserContext;
  /** Console errors, page errors and CSP violations seen so far. */
  consoleErrors: string[];
  /** Requests that left loopback. */
  externalRequests: string[];
}

export interface BrowserSession {
  browser: Browser;
  newPage(): Promise<WatchedPage>;
  close(): Promise<void>;
}

const LOOPBACK = /^(https?|wss?):\/\/(127\.\d+\.\d+\.\d+|localhost|\[::1\])(:\d+)?\//;

export async function launch(): Promise<BrowserSession> {
  // chromium.launch() already gives every run a fresh, temporary profile; playwright-core 1.65
  // refuses a --user-data-dir argument (that is launchPersistentContext's job).
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: [
      '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
      '--disable-background-networking', '--disable-component-update', '--disable-sync',
    ],
  });
  return {
    browser,
    async newPage() {
      const context = await browser.newContext({ viewport: { width: 1360, height: 900 } });
      const page = await context.newPage();
      const consoleErrors: string[] = [];
      const externalRequests: string[] = [];
      page.on('console', (msg) => {
        if (msg.type() === 'error') consoleErrors.push(msg.text());
      });
      page.on('pageerror', (err) => consoleErrors.push(String(err)));
      page.on('request', (req) => {
        const url = req.url();
        if (!url.startsWith('data:') && !url.startsWith('blob:') && !LOOPBACK.test(url)) externalRequests.push(url);
      });
      return { page, context, consoleErrors, externalRequests };
    },
    async close() {
      await browser.close();
    },
  };
}

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${baseUrl()}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}
