import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { DEMO_PASSWORD, freePort, startTestServer, type TestServer } from '../support/test-server';

export const SCREENSHOTS = path.resolve('tests/e2e/screenshots');

const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export interface E2E {
  ts: TestServer;
  browser: Browser;
  /** Every URL a page asked for, to check that nothing leaves the app's origin. */
  requests: string[];
  newPage(viewport?: { width: number; height: number }): Promise<Page>;
  shot(page: Page, name: string): Promise<void>;
  signIn(page: Page, email: string, password?: string): Promise<void>;
  close(): Promise<void>;
}

/** The built app on a real port with a fresh database, and Debian's chromium driving it. */
export async function startE2E(env: Record<string, string> = {}): Promise<E2E> {
  const port = await freePort();
  const ts = await startTestServer({ PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}`, ...env });
  const browser = await chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', args: CHROMIUM_ARGS });
  fs.mkdirSync(SCREENSHOTS, { recursive: true });
  const requests: string[] = [];
  const contexts: BrowserContext[] = [];
  const e2e: E2E = {
    ts,
    browser,
    requests,
    async newPage(viewport = { width: 1280, height: 860 }) {
      const context = await browser.newContext({ viewport, baseURL: ts.baseUrl });
      contexts.push(context);
      const page = await context.newPage();
      page.on('request', (r) => requests.push(r.url()));
      page.on('pageerror', (e) => console.error(`[page error] ${e.message}`));
      return page;
    },
    async shot(page, name) {
      await page.screenshot({ path: path.join(SCREENSHOTS, `${name}.png`), fullPage: true });
    },
    async signIn(page, email, password = DEMO_PASSWORD) {
      await page.goto('/sign-in');
      await page.getByLabel('E-mail').fill(email);
      await page.getByLabel('Password', { exact: true }).fill(password);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
    },
    async close() {
      for (const c of contexts) await c.close().catch(() => undefined);
      await browser.close();
      await ts.close();
    },
  };
  return e2e;
}

export const tmpDir = () => fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-e2e-'));
