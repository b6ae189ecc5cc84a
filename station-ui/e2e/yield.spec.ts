import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newPage, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { signInAs } from './support/sign-in';
import { api, apiToken, unitsFor, writeSimSettings, type SimSettings, type StationUnits } from './floor-units';

/*
 * The Quality screen in Chromium: a short history is made through the REST API on EOL-1 (good units and one the
 * simulator gives a wrong output voltage), then a quality manager picks the lot, reads its yield, sees a new run
 * arrive live, clicks the tallest Pareto bar and follows a serial to the run.
 */

const GOOD_UNITS = 15;

let server: StationServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let sim: SimSettings;
let units: StationUnits;
let operator: string;
const failedRunIds: number[] = [];

async function testUnit(serial: string): Promise<{ id: number; verdict: string }> {
  const started = await api<{ run: { id: number } }>(server.baseUrl, operator, `/stations/${units.stationId}/runs`, {
    method: 'POST',
    body: { serial, safetyConfirmed: true },
  });
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    const run = await api<{ id: number; verdict: string }>(server.baseUrl, operator, `/runs/${started.run.id}`);
    if (run.verdict !== 'running') return run;
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`run ${started.run.id} was still running after 30 s:\n${server.output()}`);
}

beforeAll(async () => {
  sim = await writeSimSettings(['EOL-1']);
  [server, browser] = await Promise.all([startStationServer(sim.env), launchBrowser()]);
  operator = await apiToken(server.baseUrl, 'operator');
  units = await unitsFor(server.baseUrl, operator, 'EOL-1', sim, GOOD_UNITS + 1);
  for (const serial of units.good.slice(0, GOOD_UNITS)) await testUnit(serial);
  const failed = await testUnit(units.defective);
  failedRunIds.push(failed.id);
  ({ context, page } = await newPage(browser, server.baseUrl));
});

afterAll(async () => {
  await context?.close();
  await browser?.close();
  await server?.stop();
  await sim?.remove();
});

describe('quality screen (real browser)', () => {
  it('quality picks the lot and reads its first-pass yield with the Wilson interval', async () => {
    await signInAs(page, 'quality');
    await page.goto('/quality');
    await page.getByRole('combobox', { name: 'Lot' }).click();
    await page.getByRole('option', { name: new RegExp(units.lotCode) }).click();
    await page.waitForURL(/lotId=\d+/);
    const fpy = page.getByRole('region', { name: 'First-pass yield (FPY)' });
    // 15 of 16 units passed their first test: 93.75 %
    await fpy.getByText(`${GOOD_UNITS} of`).waitFor();
    const text = await fpy.innerText();
    expect(text).toContain('93.8');
    expect(text).toMatch(/\d+\.\d – \d+\.\d %/);
    expect(text).toContain('95 % Wilson score interval');
    const table = page.getByRole('table', { name: 'Yield by lot' });
    expect(await table.innerText()).toContain(units.lotCode);
  });

  it('takes a finished run into the figures without a reload', async () => {
    await testUnit(units.good[GOOD_UNITS]!);
    const fpy = page.getByRole('region', { name: 'First-pass yield (FPY)' });
    await fpy.getByText(`${GOOD_UNITS + 1} of`).waitFor({ timeout: 15_000 });
    expect(await fpy.innerText()).toContain('94.1');
  });

  it('looks right at 1920×1080 and 1024×768', async () => {
    await page.getByRole('table', { name: 'Capability indices' }).waitFor({ timeout: 15_000 });
    await page.setViewportSize({ width: 1920, height: 1080 });
    await screenshot(page, 'quality-1920');
    await page.getByRole('heading', { name: 'Capability and control chart' }).scrollIntoViewIfNeeded();
    await screenshot(page, 'quality-capability-1920');
    await page.getByRole('region', { name: 'Run-rule findings' }).scrollIntoViewIfNeeded();
    await screenshot(page, 'quality-control-chart-1920');
    await page.setViewportSize({ width: 1024, height: 768 });
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'quality-1024');
  });

  it('clicks the Pareto bar and reaches the failing unit’s run', async () => {
    await page.setViewportSize({ width: 1440, height: 900 });
    const chart = page.getByLabel('Failure Pareto chart');
    await chart.scrollIntoViewIfNeeded();
    await chart.locator('.recharts-bar-rectangle path, .recharts-bar-rectangle').first().click();
    const unitsTable = page.getByRole('table', { name: 'Units behind the bar' });
    await unitsTable.waitFor();
    await screenshot(page, 'quality-pareto-units');
    const link = unitsTable.getByRole('link', { name: units.defective }).first();
    await link.click();
    await page.waitForURL(new RegExp(`/runs/${failedRunIds[0]}$`));
    expect(await page.getByTestId('run-serial').innerText()).toBe(units.defective);
  });
});
