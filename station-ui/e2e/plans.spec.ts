import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { fillSignIn, signInAs } from './support/sign-in';
import { api, apiToken, unitsFor, writeSimSettings, type SimSettings, type StationUnits } from './floor-units';

/*
 * The plan change flow in Chromium: an engineer starts a draft of EOL-BK0503, tightens the output-voltage limit
 * at 1.5 A, saves, runs the what-if over the stored runs and submits; a second engineer (engineer2, a demo user
 * for exactly this) sees the comparison and the what-if in the release form and releases; the station's next
 * run records the new version. Screenshots at 1920×1080.
 */

interface RunView {
  id: number;
  verdict: string;
  planVersionId: number;
  planVersion: number;
}

let server: StationServer;
let browser: Browser;
let sim: SimSettings;
let units: StationUnits;
let operator: string;
const contexts: BrowserContext[] = [];

async function page1080(): Promise<Page> {
  const context = await browser.newContext({ baseURL: server.baseUrl, viewport: { width: 1920, height: 1080 }, deviceScaleFactor: 1 });
  contexts.push(context);
  return context.newPage();
}

async function testUnit(serial: string): Promise<RunView> {
  const started = await api<{ run: RunView }>(server.baseUrl, operator, `/stations/${units.stationId}/runs`, { method: 'POST', body: { serial, safetyConfirmed: true } });
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    const run = await api<RunView>(server.baseUrl, operator, `/runs/${started.run.id}`);
    if (run.verdict !== 'running') return run;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`run ${started.run.id} still running:\n${server.output()}`);
}

beforeAll(async () => {
  sim = await writeSimSettings(['EOL-1']);
  [server, browser] = await Promise.all([startStationServer(sim.env), launchBrowser()]);
  operator = await apiToken(server.baseUrl, 'operator');
  units = await unitsFor(server.baseUrl, operator, 'EOL-1', sim, 3);
  // stored history for the what-if: two good units and one defective
  await testUnit(units.good[0]!);
  await testUnit(units.good[1]!);
  await testUnit(units.defective);
});

afterAll(async () => {
  for (const c of contexts) await c.close();
  await browser?.close();
  await server?.stop();
  await sim?.remove();
});

describe('plan change: edit, what-if, second engineer releases (real browser)', () => {
  // the demo plan has one released version, so the new draft is version 2
  const draftVersion = 2;

  it('an engineer edits a limit in a new draft and sees the what-if summary', async () => {
    const page = await page1080();
    await signInAs(page, 'engineer');
    await page.goto('/plans');
    await page.getByRole('table', { name: 'Versions' }).getByText('v1').waitFor();
    await page.getByRole('button', { name: 'New draft from this version' }).click();
    const high = page.getByLabel('voutV@1.5 high', { exact: true });
    await high.waitFor();
    await page.getByRole('heading', { name: /EOL-BK0503 version 2/ }).waitFor();
    await high.fill('5.04');
    // the server's preview: U = 0.01 V guarded → accepted 4.91 … 5.03 V
    await expect.poll(() => page.getByLabel('voutV@1.5 accepted').innerText(), { timeout: 10_000 }).toMatch(/4\.91\d* V … 5\.03\d* V/);
    // a problem appears on its own field: high below low
    await high.fill('4.5');
    await expect.poll(() => page.getByText(/must be above low \(4\.9\)/).count(), { timeout: 10_000 }).toBeGreaterThan(0);
    await high.fill('5.04');
    await expect.poll(() => page.getByText(/must be above low/).count(), { timeout: 10_000 }).toBe(0);
    await page.getByLabel('Step 3: Output voltage at half and full load').scrollIntoViewIfNeeded();
    await screenshot(page, 'plans-editor');
    await page.getByRole('button', { name: 'Save draft' }).click();
    await expect.poll(() => page.getByText('Unsaved changes').count()).toBe(0);

    await page.getByRole('button', { name: 'Re-judge stored results' }).click();
    const summary = page.getByLabel('What-if summary');
    await summary.waitFor();
    expect(await summary.innerText()).toMatch(/of 3 units/);
    expect(await summary.innerText()).toMatch(/FPY predicted/);
    await summary.scrollIntoViewIfNeeded();
    await screenshot(page, 'plans-what-if');

    await page.getByLabel('What changed and why').fill('Output at 1.5 A held to 5.04 V after the feedback divider change');
    await page.getByRole('button', { name: 'Submit for release' }).click();
    await page.getByText('submitted', { exact: true }).first().waitFor();
    // the author cannot release: the release form says who may
    expect(await page.getByText(/Someone who did not write or edit this draft releases it/).count()).toBe(1);
  });

  it('a second engineer compares the versions in the release form and releases', async () => {
    const page = await page1080();
    await page.goto('/sign-in');
    await fillSignIn(page, 'engineer2', 'engineer2-demo');
    await page.locator('nav[aria-label="Main"]').waitFor();
    await page.goto('/plans');
    await page.getByRole('table', { name: 'Versions' }).getByText(`v${draftVersion}`).click();
    const form = page.getByLabel('Release form');
    await form.waitFor();
    const changes = form.getByRole('table', { name: `Changes from version 1 to version ${draftVersion}` });
    await changes.waitFor();
    expect(await changes.innerText()).toMatch(/limits\[voutV@1\.5\]\.high\s+5\.1\s+5\.04/);
    await form.getByRole('button', { name: 'Re-judge stored results' }).count(); // the what-if panel sits above the form
    await page.getByRole('button', { name: 'Re-judge stored results' }).click();
    await form.getByLabel('What-if summary').waitFor();
    await form.scrollIntoViewIfNeeded();
    await screenshot(page, 'plans-comparison');
    await form.getByLabel('Why it is released now').fill('Reviewed: comparison and what-if checked');
    await form.getByRole('button', { name: 'Release' }).click();
    await page.getByRole('heading', { name: /version 2 released/ }).waitFor();
  });

  it("the station's next run uses the new version", async () => {
    const run = await testUnit(units.good[2]!);
    expect(run.planVersion).toBe(draftVersion);
  });
});
