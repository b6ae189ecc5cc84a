import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { mean, sampleStandardDeviation } from 'simple-statistics';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, apiToken } from './floor-units';
import { launchBrowser, screenshot } from './support/browser';
import { repo } from './support/repo';
import { startStationServer, type StationServer } from './support/server';
import { signInAs } from './support/sign-in';

/*
 * Limits from data in Chromium: an engineer uploads the demo pilot build (test-plans/characterization), reads the
 * figures of the output voltage at 1.5 A, takes the suggested limits and puts them into a draft of EOL-BK0503.
 * Screenshots at 1920×1080 and 1024×768.
 */

const DEMO_CSV = join(repo.root, 'test-plans', 'characterization', 'OB-BK0503-pilot-P2.csv');
const COLUMN = 'vout_1.5A_V';

interface LimitView {
  key: string;
  low?: number;
  high?: number;
  uncertainty?: number;
  rule?: string;
}
interface VersionView {
  id: number;
  version: number;
  steps: { key: string; limits: LimitView[] }[];
}

let server: StationServer;
let browser: Browser;
let engineer: string;
let draft: VersionView;
const contexts: BrowserContext[] = [];

async function pageAt(width: number, height: number): Promise<Page> {
  const context = await browser.newContext({ baseURL: server.baseUrl, viewport: { width, height }, deviceScaleFactor: 1 });
  contexts.push(context);
  return context.newPage();
}

/** The column's values from the demo file, read here as the outside reference for the screen's figures. */
function demoValues(): number[] {
  const [header, ...rows] = readFileSync(DEMO_CSV, 'utf8').trim().split('\n').map((l) => l.split(','));
  const i = header!.indexOf(COLUMN);
  return rows.map((r) => Number(r[i]));
}

async function chooseQuantity(page: Page, key: string): Promise<void> {
  await page.getByRole('combobox', { name: 'Quantity' }).click();
  await page.getByRole('option', { name: new RegExp(`^${key.replace(/\./g, '\\.')} `) }).click();
  await page.getByRole('heading', { name: `Figures of ${key}` }).waitFor();
}

beforeAll(async () => {
  [server, browser] = await Promise.all([startStationServer(), launchBrowser()]);
  engineer = await apiToken(server.baseUrl, 'engineer');
  const plans = await api<{ code: string; releasedVersion: { id: number } }[]>(server.baseUrl, engineer, '/plans');
  const plan = plans.find((p) => p.code === 'EOL-BK0503')!;
  draft = await api<VersionView>(server.baseUrl, engineer, `/plan-versions/${plan.releasedVersion.id}/drafts`, { method: 'POST', body: { reason: 'Limits from pilot build P2' } });
});

afterAll(async () => {
  for (const c of contexts) await c.close();
  await browser?.close();
  await server?.stop();
});

// a loaded 2-core machine: the upload, figures and draft steps each wait on the server
describe('limits from characterization data (real browser)', { timeout: 180_000 }, () => {
  it('uploads the demo pilot build, shows the figures and puts the suggested limits into a draft', async () => {
    const page = await pageAt(1920, 1080);
    await signInAs(page, 'engineer');
    await page.goto('/limits-from-data');
    await page.getByText('No data set yet').waitFor();

    // a bad file first: its problem is listed plainly and nothing is stored
    await page.locator('input[type="file"]').setInputFiles({ name: 'bad.csv', mimeType: 'text/csv', buffer: Buffer.from('serial,vout_V\nA1,5,01\n') });
    await page.getByRole('button', { name: 'Upload' }).click();
    await page.getByRole('list', { name: 'Problems in the file' }).getByText(/Line 2: the row has 3 cells but the header has 2/).waitFor();

    await page.locator('input[type="file"]').setInputFiles(DEMO_CSV);
    await page.getByLabel('Name of the data set').fill('OB-BK0503 pilot build P2');
    await page.getByRole('combobox', { name: 'Product (optional)' }).click();
    await page.getByRole('option', { name: /^OB-BK0503/ }).click();
    await page.getByRole('button', { name: 'Upload' }).click();
    await page.getByRole('heading', { name: 'Figures of iin_no_load_mA' }).waitFor();
    await chooseQuantity(page, COLUMN);

    // mean and s against simple-statistics on the same file (4 decimals shown for V: the usual 3 plus one)
    const values = demoValues();
    const figures = page.getByRole('region', { name: `Figures of ${COLUMN}` });
    await figures.getByText(`${mean(values).toFixed(4)} V`, { exact: true }).waitFor();
    await figures.getByText(`${sampleStandardDeviation(values).toFixed(4)} V`, { exact: true }).first().waitFor();
    await figures.getByText(/Anderson–Darling normality test: p =/).waitFor();

    // k moves the suggested limits: x̄ ± k·s with simple-statistics mean and sampleStandardDeviation as reference
    const m = mean(values);
    const s = sampleStandardDeviation(values);
    const suggested = page.getByTestId('suggested-limits');
    expect(await suggested.innerText()).toBe(`${(m - 4 * s).toFixed(3)} … ${(m + 4 * s).toFixed(3)} V`);
    await page.getByLabel('Width k').fill('3');
    await expect.poll(() => suggested.innerText(), { timeout: 10_000 }).toBe(`${(m - 3 * s).toFixed(3)} … ${(m + 3 * s).toFixed(3)} V`);
    await page.getByText('Suggested (mean ± 3·s)').waitFor();
    // a k the API refuses is marked on its field in the API's words
    await page.getByLabel('Width k').fill('12');
    await page.getByText('k must be at most 10').waitFor();
    await page.getByLabel('Width k').fill('4');
    await expect.poll(() => suggested.innerText(), { timeout: 10_000 }).toBe(`${(m - 4 * s).toFixed(3)} … ${(m + 4 * s).toFixed(3)} V`);
    // U guards the suggestion: ILAC-G8:09/2019 §4.2.2, acceptance limits TL + U and TL − U
    await page.getByLabel('Guard U (V)').fill('0.01');
    await expect.poll(() => page.getByTestId('guarded-limits').innerText(), { timeout: 10_000 }).toBe(`${(m - 4 * s + 0.01).toFixed(3)} … ${(m + 4 * s - 0.01).toFixed(3)} V`);

    await page.getByRole('button', { name: 'Use suggested limits' }).click();
    const indices = page.getByRole('table', { name: 'Capability indices' });
    // limits at mean ± 4·s give Ppk = 4/3 (the suggestion's rule, src/stats/limits.ts)
    await expect.poll(() => indices.getByRole('row', { name: /^Ppk/ }).innerText(), { timeout: 10_000 }).toMatch(/1\.33/);
    await page.getByText(/Expected outside proposed limits/).waitFor();
    const low = Number(await page.getByLabel(`Proposed low (V)`).inputValue());
    const high = Number(await page.getByLabel(`Proposed high (V)`).inputValue());
    expect(low).toBeLessThan(high);
    await figures.scrollIntoViewIfNeeded();
    await page.evaluate(() => window.scrollTo(0, 0));
    const shot1920 = await screenshot(page, 'characterization-1920');
    expect(shot1920).toMatch(/characterization-1920\.png$/);

    // put into the draft: the plan of the product and its only draft are chosen already
    await expect.poll(() => page.getByRole('combobox', { name: 'Draft version' }).inputValue()).toMatch(new RegExp(`^v${draft.version} `));
    await page.getByRole('combobox', { name: 'Limit' }).click();
    await page.getByRole('option', { name: /^voutV@1\.5 · now/ }).click();
    await page.getByLabel('Reason').fill('Pilot build P2, 60 units: limits at mean ± 4 s');
    await page.getByRole('button', { name: 'Put into draft…' }).click();
    const dialog = page.getByRole('dialog', { name: 'Put these limits into the draft?' });
    await dialog.getByText(/EOL-BK0503 version/).waitFor();
    await dialog.getByText(/Uncertainty U becomes ± 0\.01 V with the guarded rule/).waitFor();
    await dialog.getByRole('button', { name: 'Put into draft', exact: true }).click();
    await page.getByText('Limit put into the draft').waitFor();

    const after = await api<VersionView>(server.baseUrl, engineer, `/plan-versions/${draft.id}`);
    const limit = after.steps.find((s) => s.key === 'vout-load')!.limits.find((l) => l.key === 'voutV@1.5')!;
    expect(limit.low).toBeCloseTo(low, 9);
    expect(limit.high).toBeCloseTo(high, 9);
    // the U the engineer chose guards the limit, and the audit trail records the k and U of the suggestion
    expect(limit).toMatchObject({ uncertainty: 0.01, rule: 'guarded' });
    const audit = await api<{ items: { action: string; after: { statistics?: { suggestion?: { k: number; uncertainty: number } } } | null }[] }>(
      server.baseUrl,
      engineer,
      '/audit?action=characterization.limits_accepted',
    );
    const accepted = audit.items.find((e) => e.action === 'characterization.limits_accepted');
    expect(accepted?.after?.statistics?.suggestion).toMatchObject({ k: 4, uncertainty: 0.01 });
  });

  it('fits the figures on a 1024×768 screen', async () => {
    const page = await pageAt(1024, 768);
    await signInAs(page, 'engineer');
    await page.goto('/limits-from-data');
    await page.getByRole('heading', { name: 'Figures of iin_no_load_mA' }).waitFor();
    await chooseQuantity(page, COLUMN);
    await page.getByLabel('Guard U (V)').fill('0.01');
    await page.getByTestId('guarded-limits').getByText(/…/).waitFor();
    await page.getByRole('button', { name: 'Use suggested limits' }).click();
    await expect.poll(() => page.getByRole('table', { name: 'Capability indices' }).getByRole('row', { name: /^Ppk/ }).innerText(), { timeout: 10_000 }).toMatch(/1\.33/);
    await page.getByText(/dotted slate: suggested limits guarded by U/).waitFor();
    // no sideways scrolling at this width
    expect(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true);
    await page.getByRole('heading', { name: `Figures of ${COLUMN}` }).scrollIntoViewIfNeeded();
    await page.evaluate(() => {
      const h = Array.from(document.querySelectorAll('h2')).find((e) => e.textContent?.startsWith('Figures of'));
      h?.scrollIntoView({ block: 'start' });
      // the app bar stays on top: keep the section title below it
      window.scrollBy(0, -76);
    });
    await screenshot(page, 'characterization-1024');
  });
});
