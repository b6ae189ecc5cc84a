import type { Browser, BrowserContext, Page } from 'playwright-core';
import { readFile } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newPage, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { signInAs } from './support/sign-in';
import { api, apiToken, writeSimSettings, type SimSettings } from './floor-units';

/*
 * Lots in Chromium: quality opens a lot of three units in the form, the units are tested on EOL-1 through the REST
 * API (the simulator models every unit it is not told about as good), quality sees the lot ready, releases it
 * after the confirmation and downloads the certificate of conformance.
 */

const LOT_CODE = 'LB-2701-09';
// a week no demo lot uses, so the serials are free
const SERIALS = ['K5A-2701-00001', 'K5A-2701-00002', 'K5A-2701-00003'];

let server: StationServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let sim: SimSettings;

async function testUnit(token: string, stationId: number, serial: string): Promise<string> {
  const started = await api<{ run: { id: number } }>(server.baseUrl, token, `/stations/${stationId}/runs`, { method: 'POST', body: { serial, safetyConfirmed: true } });
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    const run = await api<{ verdict: string }>(server.baseUrl, token, `/runs/${started.run.id}`);
    if (run.verdict !== 'running') return run.verdict;
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`run ${started.run.id} was still running after 30 s:\n${server.output()}`);
}

beforeAll(async () => {
  sim = await writeSimSettings(['EOL-1']);
  [server, browser] = await Promise.all([startStationServer(sim.env), launchBrowser()]);
  ({ context, page } = await newPage(browser, server.baseUrl));
});

afterAll(async () => {
  await context?.close();
  await browser?.close();
  await server?.stop();
  await sim?.remove();
});

describe('lots (real browser)', () => {
  it('quality creates a lot with a serial range in the form', async () => {
    await signInAs(page, 'quality');
    await page.goto('/lots');
    await page.getByRole('table', { name: 'Lots' }).waitFor();
    await page.setViewportSize({ width: 1024, height: 768 });
    await screenshot(page, 'lots-1024');
    await page.setViewportSize({ width: 1440, height: 900 });
    await page.getByRole('button', { name: 'New lot' }).click();
    const dialog = page.getByRole('dialog', { name: 'New lot' });
    await dialog.getByLabel('Lot code').fill(LOT_CODE);
    await dialog.getByLabel('Planned quantity').fill(String(SERIALS.length));
    await dialog.getByLabel('Product', { exact: false }).first().click();
    await page.getByRole('option', { name: /OB-BK0503/ }).click();
    await dialog.getByLabel('First serial').fill(SERIALS[0]);
    await dialog.getByLabel('Last serial').fill(SERIALS[SERIALS.length - 1]);
    await dialog.getByRole('button', { name: 'Create lot' }).click();
    const detail = page.getByRole('region', { name: `Lot ${LOT_CODE}` });
    await detail.waitFor();
    const units = detail.getByRole('table', { name: `Units of lot ${LOT_CODE}` });
    for (const s of SERIALS) await units.getByRole('link', { name: s }).waitFor();
    expect(await detail.getByRole('status').innerText()).toContain('3 units not yet tested');
  });

  it('after the units are tested, quality releases the lot and the certificate downloads', async () => {
    const quality = await apiToken(server.baseUrl, 'quality');
    const operator = await apiToken(server.baseUrl, 'operator');
    const lots = await api<{ id: number; code: string }[]>(server.baseUrl, quality, '/lots');
    const lot = lots.find((l) => l.code === LOT_CODE)!;
    const stations = await api<{ id: number; code: string }[]>(server.baseUrl, quality, '/stations');
    const eol1 = stations.find((s) => s.code === 'EOL-1')!;
    await api(server.baseUrl, quality, `/stations/${eol1.id}`, { method: 'PATCH', body: { activeLotId: lot.id } });
    for (const s of SERIALS) expect(await testUnit(operator, eol1.id, s)).toBe('pass');

    await page.reload();
    const detail = page.getByRole('region', { name: `Lot ${LOT_CODE}` });
    await detail.getByText('Ready to release').waitFor();
    await page.setViewportSize({ width: 1920, height: 1080 });
    await screenshot(page, 'lots-1920');
    await detail.getByRole('button', { name: 'Release lot' }).click();
    const confirm = page.getByRole('dialog', { name: `Release lot ${LOT_CODE}?` });
    await confirm.getByLabel(/Comment/).fill('First delivery of week 01');
    await screenshot(page, 'lot-release-1920');
    await confirm.getByRole('button', { name: 'Release and issue certificate' }).click();
    const download = detail.getByRole('button', { name: 'Download certificate of conformance (PDF)' });
    await download.waitFor();
    const [file] = await Promise.all([page.waitForEvent('download'), download.click()]);
    expect(file.suggestedFilename()).toBe(`certificate-of-conformance-${LOT_CODE}.pdf`);
    const bytes = await readFile((await file.path())!);
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(await page.getByRole('table', { name: 'Lots' }).getByRole('row', { name: new RegExp(LOT_CODE) }).innerText()).toContain('Released');
  });
});
