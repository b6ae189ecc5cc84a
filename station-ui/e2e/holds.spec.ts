import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newPage, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { signInAs } from './support/sign-in';
import { api, apiToken, unitsFor, writeSimSettings, type SimSettings, type StationUnits } from './floor-units';

/*
 * Holds in Chromium: quality adds a first-pass-yield rule for OB-BK0503 (last 10 units, below 95 %), nine good
 * units are tested on EOL-1 through the REST API, and quality has the Holds page open. The tenth unit (the one
 * the simulator gives a wrong output voltage) fails: 9 of 10 is 90 %, the lot goes on hold, the page shows it
 * without a reload, the operator's station shows the reason, and quality lifts the hold with a reason. The
 * server starts its own capture SMTP server (MAIL_CAPTURE), so the e-mail is sent and the outbox says so.
 */

const GOOD_UNITS = 9;

let server: StationServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let operatorContext: BrowserContext;
let operatorPage: Page;
let sim: SimSettings;
let units: StationUnits;
let operator: string;
let reason: string;

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
  [server, browser] = await Promise.all([startStationServer({ ...sim.env, MAIL_CAPTURE: '1', MAIL_CAPTURE_PORT: '0' }), launchBrowser()]);
  operator = await apiToken(server.baseUrl, 'operator');
  const quality = await apiToken(server.baseUrl, 'quality');
  units = await unitsFor(server.baseUrl, operator, 'EOL-1', sim, GOOD_UNITS);
  const products = await api<{ id: number; partNumber: string }[]>(server.baseUrl, quality, '/products');
  const productId = products.find((p) => p.partNumber === 'OB-BK0503')!.id;
  await api(server.baseUrl, quality, '/hold-rules', { method: 'POST', body: { productId, kind: 'fpy', windowUnits: 10, minFpyPct: 95 } });
  for (const serial of units.good.slice(0, GOOD_UNITS)) await testUnit(serial);
  ({ context, page } = await newPage(browser, server.baseUrl));
  ({ context: operatorContext, page: operatorPage } = await newPage(browser, server.baseUrl));
});

afterAll(async () => {
  await context?.close();
  await operatorContext?.close();
  await browser?.close();
  await server?.stop();
  await sim?.remove();
});

describe('holds and alerts (real browser)', () => {
  it('quality has the Holds page open: no lot on hold, the rule listed', async () => {
    await signInAs(page, 'quality');
    await page.goto('/holds');
    await page.getByText('No lot is on hold').waitFor();
    expect(await page.getByRole('table', { name: 'Hold rules' }).innerText()).toContain('first-pass yield of the last 10 units is below 95 %');
    await page.getByText('Live', { exact: true }).waitFor();
  });

  it('a tripping run arrives: the hold appears live, without a reload', async () => {
    await page.evaluate(() => ((window as unknown as { stillHere: boolean }).stillHere = true));
    const failed = await testUnit(units.defective);
    expect(failed.verdict).toBe('fail');
    const card = page.getByRole('article', { name: `Lot ${units.lotCode} on hold` });
    await card.waitFor({ timeout: 15_000 });
    const text = await card.innerText();
    reason = 'First-pass yield of the last 10 units 90.0 % (below 95 %)';
    expect(text).toContain(reason);
    expect(text).toContain('9 of 10 units passed first time');
    expect(text).toContain(`run ${failed.id}`);
    expect(await page.evaluate(() => (window as unknown as { stillHere?: boolean }).stillHere)).toBe(true);
  });

  it('the station shows the hold reason', async () => {
    await signInAs(operatorPage, 'operator');
    await operatorPage.waitForURL('**/station');
    await operatorPage.getByRole('button', { name: /^EOL-1,/ }).click();
    await operatorPage.getByText(`Lot ${units.lotCode} is on hold: ${reason}`).first().waitFor({ timeout: 15_000 });
    await screenshot(operatorPage, 'holds-station-blocked');
  });

  it('looks right at 1920×1080 and 1024×768', async () => {
    await page.setViewportSize({ width: 1920, height: 1080 });
    await screenshot(page, 'holds-1920');
    await page.setViewportSize({ width: 1024, height: 768 });
    await screenshot(page, 'holds-1024');
    await page.setViewportSize({ width: 1440, height: 900 });
  });

  it('the e-mail went out and is in the outbox; the alert is listed', async () => {
    await page.getByRole('tab', { name: 'Outbox' }).click();
    const outbox = page.getByRole('table', { name: 'Outbox' });
    await outbox.getByText('Sent', { exact: true }).waitFor({ timeout: 15_000 });
    const text = await outbox.innerText();
    expect(text).toContain('quality@orrinbay.example');
    expect(text).toContain(`Lot ${units.lotCode} (OB-BK0503) is on hold`);
    await page.getByRole('tab', { name: 'Alerts' }).click();
    expect(await page.getByRole('table', { name: 'Alerts' }).innerText()).toContain(`Lot ${units.lotCode} is on hold: ${reason}`);
  });

  it('quality lifts the hold with a reason; the station is free again', async () => {
    const card = page.getByRole('article', { name: `Lot ${units.lotCode} on hold` });
    await card.getByRole('button', { name: 'Lift hold' }).click();
    const dialog = page.getByRole('dialog', { name: `Lift the hold on lot ${units.lotCode}` });
    await dialog.getByLabel('Why may testing go on?').fill('Feedback divider of unit checked: a single wrong part, reel is fine');
    await dialog.getByLabel(`I confirm that testing of lot ${units.lotCode} may go on`).check();
    await screenshot(page, 'holds-lift-dialog');
    await dialog.getByRole('button', { name: 'Lift hold' }).click();
    await page.getByText('No lot is on hold').waitFor({ timeout: 15_000 });
    await operatorPage.getByText(`Lot ${units.lotCode} is on hold`).first().waitFor({ state: 'detached', timeout: 15_000 });
    const quality = await apiToken(server.baseUrl, 'quality');
    const audit = await api<{ items: { action: string; reason: string }[] }>(server.baseUrl, quality, '/audit?entityType=hold');
    expect(audit.items.find((e) => e.action === 'hold.lifted')?.reason).toBe('Feedback divider of unit checked: a single wrong part, reel is fine');
  });
});
