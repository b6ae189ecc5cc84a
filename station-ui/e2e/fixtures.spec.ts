import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { signInAs } from './support/sign-in';

/*
 * The fixtures page in Chromium against the built server (demo seed): an engineer records a calibration with
 * its certificate PDF and sees it in force; the demo's FX-103 falls due within the warning window and shows
 * the heads-up. Screenshots at 1920×1080 and 1024×768.
 */

/** A small, well-formed PDF (header per ISO 32000-1:2008 §7.5.2) standing in for a scanned certificate */
const PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n',
  'latin1',
);

let server: StationServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;

beforeAll(async () => {
  [server, browser] = await Promise.all([startStationServer(), launchBrowser()]);
  context = await browser.newContext({ baseURL: server.baseUrl, viewport: { width: 1920, height: 1080 }, deviceScaleFactor: 1 });
  page = await context.newPage();
});

afterAll(async () => {
  await context?.close();
  await browser?.close();
  await server?.stop();
});

describe('fixtures page (real browser)', () => {
  it('shows every fixture with its status in words, and the demo fixture due soon with a heads-up', async () => {
    await signInAs(page, 'engineer');
    await page.goto('/fixtures');
    for (const code of ['FX-101', 'FX-102', 'FX-103']) await page.getByTestId(`fixture-${code}`).waitFor();
    expect(await page.getByTestId('fixture-FX-101').getByTestId('fixture-status').innerText()).toBe('In service');
    const fx103 = page.getByTestId('fixture-FX-103');
    expect(await fx103.getByTestId('fixture-status').innerText()).toBe('Calibration due soon');
    expect(await fx103.innerText()).toMatch(/Calibration due \d{1,2} \w{3} \d{4} \(in \d+ days?\); book the recalibration/);
    expect(await fx103.innerText()).toContain('EOL-3');
  });

  it('records a calibration with its certificate PDF; the new record is in force with its file', async () => {
    const fx102 = page.getByTestId('fixture-FX-102');
    await fx102.getByRole('button', { name: 'Record calibration' }).click();
    const dialog = page.getByRole('dialog', { name: 'Record a calibration of FX-102' });
    await dialog.waitFor();
    await dialog.getByLabel('Certificate number').fill('OBE-CAL-26-2417');
    await dialog.getByLabel('Output voltage (V)').fill('0.006');
    await dialog.getByLabel('Output ripple and noise, peak-to-peak (mV)').fill('1.2');
    await dialog.locator('input[type="file"]').setInputFiles({ name: 'OBE-CAL-26-2417.pdf', mimeType: 'application/pdf', buffer: PDF });
    await dialog.getByRole('button', { name: 'Record calibration' }).click();
    await dialog.waitFor({ state: 'detached' });

    const table = fx102.getByRole('table', { name: 'Calibration records of FX-102' });
    const first = table.locator('tbody tr').first();
    await first.getByText('OBE-CAL-26-2417').waitFor();
    const row = await first.innerText();
    expect(row).toMatch(/in force/i);
    expect(row).toContain('Test engineer');
    expect(row).toContain('Output voltage: ± 0.006 V');
    expect(row).toContain(`PDF · ${PDF.length} B`);

    // the download is the uploaded file, served as a PDF
    const [download] = await Promise.all([page.waitForEvent('download'), first.getByRole('button', { name: /Download certificate OBE-CAL-26-2417/ }).click()]);
    expect(download.suggestedFilename()).toBe('OBE-CAL-26-2417.pdf');

    // 1920: the fixture just calibrated (its new record with the PDF) and the one due soon below it
    await fx102.evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await screenshot(page, 'fixtures-1920');
    // 1024: the page as it opens, every fixture at a glance
    await page.setViewportSize({ width: 1024, height: 768 });
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.getByRole('table', { name: 'Fixtures at a glance' }).waitFor();
    await screenshot(page, 'fixtures-1024');
  });
});
