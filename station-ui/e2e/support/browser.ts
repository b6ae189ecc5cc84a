import { existsSync } from 'node:fs';
import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { repo } from './repo';

/** Debian's package; the tests never download a browser. */
export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

export const VIEWPORT = { width: 1440, height: 900 } as const;

export async function launchBrowser(): Promise<Browser> {
  if (!existsSync(CHROMIUM_PATH)) {
    throw new Error(`Chromium is not installed at ${CHROMIUM_PATH}. Install it with: apt-get update && apt-get install -y chromium`);
  }
  return chromium.launch({
    executablePath: CHROMIUM_PATH,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--disable-quic',
      '--no-first-run',
    ],
  });
}

/** A fresh context (own localStorage, so no token leaks between tests) at 1440×900. */
export async function newPage(browser: Browser, baseUrl: string): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ baseURL: baseUrl, viewport: VIEWPORT, deviceScaleFactor: 1 });
  const page = await context.newPage();
  return { context, page };
}

/** Saves `docs/screenshots/<name>.png`, overwriting the last run's, once fonts have loaded. */
export async function screenshot(page: Page, name: string): Promise<string> {
  await mkdir(repo.screenshots, { recursive: true });
  await page.evaluate(() => document.fonts.ready);
  const path = join(repo.screenshots, `${name}.png`);
  await page.screenshot({ path, fullPage: false, animations: 'disabled' });
  return path;
}
