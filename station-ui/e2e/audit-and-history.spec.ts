import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newPage, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { signInAs } from './support/sign-in';
import { api, apiToken, unitsFor, writeSimSettings, type SimSettings, type StationUnits } from './floor-units';

/*
 * The audit trail and the unit history in Chromium. Through the REST API: a unit fails on EOL-1, goes to repair
 * (received, returned) and an engineer changes a limit in a draft. Then quality filters the audit trail to units,
 * follows a record to the unit's history, and an engineer scans a serial in the header box and reads its history.
 */

let server: StationServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let sim: SimSettings;
let units: StationUnits;
let failedRunId: number;

async function finishedRun(token: string, runId: number): Promise<{ id: number; verdict: string }> {
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    const run = await api<{ id: number; verdict: string }>(server.baseUrl, token, `/runs/${runId}`);
    if (run.verdict !== 'running') return run;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`run ${runId} was still running after 30 s:\n${server.output()}`);
}

beforeAll(async () => {
  sim = await writeSimSettings(['EOL-1']);
  [server, browser] = await Promise.all([startStationServer(sim.env), launchBrowser()]);
  const operator = await apiToken(server.baseUrl, 'operator');
  const engineer = await apiToken(server.baseUrl, 'engineer');
  units = await unitsFor(server.baseUrl, operator, 'EOL-1', sim);
  const started = await api<{ run: { id: number } }>(server.baseUrl, operator, `/stations/${units.stationId}/runs`, {
    method: 'POST',
    body: { serial: units.defective, safetyConfirmed: true },
  });
  failedRunId = (await finishedRun(operator, started.run.id)).id;
  await api(server.baseUrl, operator, `/units/${units.defective}/send-to-repair`, { method: 'POST', body: { note: 'output low at full load' } });
  await api(server.baseUrl, engineer, `/units/${units.defective}/repair`, { method: 'POST', body: { action: 'receive', note: 'on bench 2' } });
  // returning for retest takes a repair record: symptom, a cause from the engineers' list, the action taken
  const causes = await api<{ id: number }[]>(server.baseUrl, engineer, '/repair-causes');
  const record = { symptom: 'output low at full load', causeId: causes[0]!.id, actionTaken: 'feedback resistor R7 replaced' };
  await api(server.baseUrl, engineer, `/units/${units.defective}/repair`, { method: 'POST', body: { action: 'return', note: 'feedback resistor R7 replaced', ...record } });
  // a limit change, so the trail holds a plan edit in words
  const plans = await api<{ releasedVersion: { id: number } }[]>(server.baseUrl, engineer, '/plans');
  const draft = await api<{ id: number; steps: { limits: { high?: number }[] }[] }>(server.baseUrl, engineer, `/plan-versions/${plans[0]!.releasedVersion.id}/drafts`, {
    method: 'POST',
    body: { reason: 'Limit review after pilot build' },
  });
  const steps = structuredClone(draft.steps);
  const limit = steps.flatMap((s) => s.limits).find((l) => typeof l.high === 'number')!;
  limit.high = Math.round(limit.high! * 0.99 * 1000) / 1000;
  await api(server.baseUrl, engineer, `/plan-versions/${draft.id}`, { method: 'PATCH', body: { steps, reason: 'tighter after pilot data' } });
  ({ context, page } = await newPage(browser, server.baseUrl));
});

afterAll(async () => {
  await context?.close();
  await browser?.close();
  await server?.stop();
  await sim?.remove();
});

describe('audit trail and unit history (real browser)', () => {
  it('quality filters the audit trail to units, reads the records in words and follows one to the unit', async () => {
    await signInAs(page, 'quality');
    await page.getByRole('link', { name: 'Audit trail' }).click();
    const table = page.getByRole('table', { name: 'Audit records' });
    await table.waitFor();
    await expect.poll(() => table.getByText(/^Changed the high limit of .+ from .+ to .+$/).count(), { timeout: 10_000 }).toBeGreaterThan(0);

    // the newest record (the limit change) opened to its before and after, for the screenshots
    await page.getByRole('button', { name: /^Show before and after of record/ }).first().click();
    await expect.poll(() => page.getByLabel('Before and after', { exact: true }).first().innerText()).toMatch(/^High limit of [\s\S]+ → /);
    await page.setViewportSize({ width: 1024, height: 768 });
    await screenshot(page, 'audit-1024');
    await page.setViewportSize({ width: 1920, height: 1080 });
    await screenshot(page, 'audit-1920');
    await page.setViewportSize({ width: 1440, height: 900 });

    await page.getByRole('combobox', { name: 'Object', exact: true }).click();
    await page.getByRole('option', { name: 'Unit' }).click();
    await page.waitForURL('**/audit?type=unit');
    // the unfiltered list holds these rows too: wait for the filtered answer itself (reading once raced it)
    const whats = async () => (await table.locator('tbody tr td:nth-child(4)').allInnerTexts()).map((t) => t.trim());
    await expect.poll(whats, { timeout: 10_000 }).toEqual([
      `Returned unit ${units.defective} from repair for retest`,
      `Received unit ${units.defective} in repair`,
      `Sent unit ${units.defective} to repair`,
    ]);
    await page.getByRole('button', { name: /^Show before and after of record/ }).first().click();
    await expect.poll(() => page.getByLabel('Before and after', { exact: true }).first().innerText()).toMatch(/State\s+in repair → untested/);

    // a filtered view is an address: the search box narrows it further
    await page.getByRole('textbox', { name: /^Search/ }).fill('bench 2');
    await page.getByRole('button', { name: 'Show', exact: true }).click();
    await page.waitForURL(/\/audit\?type=unit&q=bench\+2$/);
    await expect.poll(() => table.locator('tbody tr').count()).toBe(1);
    await table.getByRole('link', { name: `Received unit ${units.defective} in repair` }).click();
    await page.waitForURL(`**/units/${units.defective}`);
    await page.getByRole('heading', { name: units.defective }).waitFor();
  });

  it('an engineer types a serial in lower case into the header box and reads its history', async () => {
    await page.context().clearCookies();
    await page.evaluate(() => localStorage.clear());
    await signInAs(page, 'engineer');
    await page.goto('/runs');
    const box = page.getByRole('search', { name: 'Find a unit' }).getByRole('textbox', { name: 'Serial' });
    await box.fill(`  ${units.defective.toLowerCase()} `);
    await box.press('Enter');
    await page.waitForURL(`**/units/${units.defective}`);
    await page.getByRole('heading', { name: units.defective }).waitFor();
    expect(await page.getByTestId('unit-state').innerText()).toBe('Untested');
    expect(await page.getByText('Returned from repair: waiting for retest').count()).toBe(1);
    const timeline = page.getByRole('list', { name: 'Timeline' });
    const items = timeline.locator(':scope > li');
    // the run, its safety confirmation, sent to repair, received, returned
    await expect.poll(() => items.count()).toBe(5);
    expect(await items.nth(0).innerText()).toContain('Returned unit');
    expect(await items.nth(0).innerText()).toContain('feedback resistor R7 replaced');
    const run = timeline.getByRole('listitem', { name: `Run ${failedRunId}` });
    expect(await run.innerText()).toMatch(/FAIL/);
    expect(await run.innerText()).toContain('EOL-1');
    // the newest run opens by itself when it did not pass
    const toggle = run.getByRole('button', { name: /measurements/ });
    if ((await toggle.getAttribute('aria-expanded')) !== 'true') await toggle.click();
    const measurements = run.getByRole('table', { name: 'Measurements' });
    await measurements.waitFor();
    expect(await measurements.locator('tbody tr').count()).toBeGreaterThan(1);
    await page.setViewportSize({ width: 1024, height: 768 });
    await screenshot(page, 'unit-history-1024');
    await page.setViewportSize({ width: 1920, height: 1080 });
    await screenshot(page, 'unit-history-1920');
    await page.setViewportSize({ width: 1440, height: 900 });

    await run.getByRole('link', { name: `#${failedRunId}` }).click();
    await page.waitForURL(`**/runs/${failedRunId}`);
  });

  it('a scan (fast keystrokes ending in Enter) on an office screen opens the history; an unknown serial is said in words', async () => {
    await page.goto('/runs');
    await page.getByRole('table', { name: 'Runs' }).waitFor();
    await page.locator('body').click({ position: { x: 5, y: 300 } });
    await page.keyboard.type(units.defective, { delay: 5 });
    await page.keyboard.press('Enter');
    await page.waitForURL(`**/units/${units.defective}`);

    const box = page.getByRole('search', { name: 'Find a unit' }).getByRole('textbox', { name: 'Serial' });
    await box.fill('ZZZ-0000-00000');
    await box.press('Enter');
    await expect.poll(() => page.getByRole('alert').filter({ hasText: 'No unit with serial ZZZ-0000-00000 is registered' }).count()).toBe(1);
    expect(page.url()).toContain(`/units/${units.defective}`);
  });

  it('the station screen has no header serial box (the station scans for testing)', async () => {
    await page.goto('/station');
    await page.locator('nav[aria-label="Main"]').waitFor();
    expect(await page.getByRole('search', { name: 'Find a unit' }).count()).toBe(0);
  });
});
