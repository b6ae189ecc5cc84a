import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newPage, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { signInAs } from './support/sign-in';
import { api, apiToken, unitsFor, writeSimSettings, type SimSettings, type StationUnits } from './floor-units';

/*
 * The traceability screens in Chromium: two runs are made through the REST API on EOL-1 (one good unit,
 * one the simulator gives a wrong output voltage), then a quality manager finds the failed one by verdict
 * and reads its measurements and what it was tested with.
 */

/** The fields of a run (GET /api/runs/:id) this test reads. */
interface RunView {
  id: number;
  verdict: string;
  planCode: string;
  planVersion: number;
  fixtureCode: string;
  fixtureIdentity: string | null;
  operatorName: string;
}

let server: StationServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let sim: SimSettings;
let units: StationUnits;
const made: { pass?: RunView; fail?: RunView } = {};

/** Polls GET /api/runs/:id until the engine has judged the unit (instant simulator timing: well under a second). */
async function finishedRun(token: string, runId: number): Promise<RunView> {
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    const run = await api<RunView>(server.baseUrl, token, `/runs/${runId}`);
    if (run.verdict !== 'running') return run;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`run ${runId} was still running after 30 s:\n${server.output()}`);
}

async function testUnit(token: string, serial: string): Promise<RunView> {
  const started = await api<{ run: RunView }>(server.baseUrl, token, `/stations/${units.stationId}/runs`, {
    method: 'POST',
    body: { serial, safetyConfirmed: true },
  });
  return finishedRun(token, started.run.id);
}

beforeAll(async () => {
  sim = await writeSimSettings(['EOL-1']);
  [server, browser] = await Promise.all([startStationServer(sim.env), launchBrowser()]);
  const operator = await apiToken(server.baseUrl, 'operator');
  units = await unitsFor(server.baseUrl, operator, 'EOL-1', sim);
  made.pass = await testUnit(operator, units.good[0]!);
  made.fail = await testUnit(operator, units.defective);
  ({ context, page } = await newPage(browser, server.baseUrl));
});

afterAll(async () => {
  await context?.close();
  await browser?.close();
  await server?.stop();
  await sim?.remove();
});

describe('runs list and run detail (real browser)', () => {
  it('the REST API made one passing and one failing run', () => {
    expect(made.pass?.verdict).toBe('pass');
    expect(made.fail?.verdict).toBe('fail');
  });

  it('quality lists the runs and filters them by verdict = FAIL through the address', async () => {
    await signInAs(page, 'quality');
    await page.goto('/runs');
    const rows = page.locator('table[aria-label="Runs"] tbody tr');
    await rows.first().waitFor();
    expect(await rows.count()).toBe(2);
    expect(await rows.evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-verdict')))).toEqual(['fail', 'pass']);
    await screenshot(page, 'runs-list');

    await page.getByRole('combobox', { name: 'Verdict' }).click();
    await page.getByRole('option', { name: 'FAIL' }).click();
    await page.waitForURL(/\/runs\?verdict=fail$/);
    await page.waitForFunction(() => document.querySelectorAll('table[aria-label="Runs"] tbody tr').length === 1);
    const row = rows.first();
    expect(await row.getAttribute('data-run-id')).toBe(String(made.fail!.id));
    expect(await row.innerText()).toContain(units.defective);
    // issue 12: the failed step is shown by its name; the internal key is only its tooltip
    const stepCell = row.locator('td[title]').last();
    const key = await stepCell.getAttribute('title');
    expect(key).toMatch(/\w/);
    expect((await stepCell.innerText()).trim()).not.toBe(key);
  });

  it('sorts the runs by a column heading on the server, and finds a serial by a lower-case part (issue 12)', async () => {
    await page.goto('/runs');
    const rows = page.locator('table[aria-label="Runs"] tbody tr');
    await rows.first().waitFor();
    await page.getByRole('button', { name: 'Sort by serial, ascending' }).click();
    await page.waitForURL(/\/runs\?sort=serial&dir=asc$/);
    const serials = async () => rows.evaluateAll((trs) => trs.map((tr) => tr.getAttribute('aria-label')!.split(', ')[1]));
    // the table may still show the last answer for a moment after the address changes (its aria-busy turns true only
    // once the new request starts), so wait for the sorted order itself
    await expect.poll(serials, { timeout: 10_000 }).toEqual([units.good[0]!, units.defective].sort());
    await page.getByRole('button', { name: 'Sort by serial, descending' }).click();
    await page.waitForURL(/\/runs\?sort=serial&dir=desc$/);
    await page.waitForFunction((first) => document.querySelector('table[aria-label="Runs"] tbody tr')?.getAttribute('aria-label')?.includes(first) === true, [units.good[0]!, units.defective].sort().reverse()[0]!);
    await page.locator('main').getByLabel('Serial', { exact: true }).and(page.locator('input')).fill(units.defective.slice(-9).toLowerCase());
    await page.keyboard.press('Enter');
    await page.waitForFunction(() => document.querySelectorAll('table[aria-label="Runs"] tbody tr').length === 1);
    expect(await rows.first().getAttribute('data-verdict')).toBe('fail');
    await page.goto('/runs?verdict=fail');
    await rows.first().waitFor();
  });

  it('opens the failed run from the keyboard and shows the failing measurement and the traceability', async () => {
    await page.locator('table[aria-label="Runs"] tbody tr').first().focus();
    await page.keyboard.press('Enter');
    await page.waitForURL(`**/runs/${made.fail!.id}`);
    const table = page.locator('table[aria-label="Measurements"]');
    await table.waitFor();

    expect(await page.getByTestId('run-serial').innerText()).toBe(units.defective);
    expect(await page.getByTestId('run-context').innerText()).toContain(units.lotCode);
    expect(await page.getByTestId('trace-plan').innerText()).toBe(`${made.fail!.planCode} v${made.fail!.planVersion}`);
    expect(await page.getByTestId('trace-fixture').innerText()).toBe(made.fail!.fixtureCode);
    expect(await page.getByTestId('trace-fixture-identity').innerText()).toBe(made.fail!.fixtureIdentity ?? 'not recorded');
    expect(await page.getByTestId('trace-calibration').innerText()).toMatch(/^\d{4}-\d{2}-\d{2}/);
    expect(await page.getByTestId('trace-cycles').innerText()).toMatch(/^\d+$/);
    expect(await page.getByTestId('trace-operator').innerText()).toBe(made.fail!.operatorName);

    // wrong_feedback sets the output off: at least one output-voltage row is judged outside its limits
    const failing = table.locator('tbody tr[data-verdict="fail"], tbody tr[data-verdict="guard_fail"]');
    expect(await failing.count()).toBeGreaterThan(0);
    const text = await failing.first().innerText();
    expect(text).toContain('FAIL');
    expect(text).toMatch(/\d+\.\d{3}\s*V/);
    expect(text).toMatch(/ … /);
    expect(await page.getByRole('button', { name: 'Repair tag (PDF)' }).isVisible()).toBe(true);

    // raw readings unfold under their row
    await failing.first().getByRole('button', { name: /^Show raw readings/ }).click();
    await table.locator('pre').first().waitFor();
    await screenshot(page, 'run-detail');
  });

  it('names the calibration record the run was judged with, near the fixture (issue 10)', async () => {
    const detail = await api<{ calibration: { id: number; certificateNumber: string } | null }>(server.baseUrl, await apiToken(server.baseUrl, 'quality'), `/runs/${made.fail!.id}`);
    // EOL-1's fixture FX-101 carries the seeded record OBE-CAL-26-0311, in force since the plant was set up
    expect(detail.calibration).toMatchObject({ certificateNumber: 'OBE-CAL-26-0311' });
    const block = page.getByTestId('trace-calibration-record');
    expect(await block.getByTestId('trace-cal-id').innerText()).toBe(`#${detail.calibration!.id} (still in force)`);
    expect(await block.getByTestId('trace-cal-certificate').innerText()).toBe('OBE-CAL-26-0311');
    expect(await block.getByTestId('trace-cal-due').innerText()).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    const uTable = block.getByRole('table', { name: 'Uncertainty used for guard banding' });
    expect(await uTable.innerText()).toMatch(/Output voltage[\s\S]*± 0\.01 V/);
    // quality may not open the Fixtures page (engineers only), so no link leads there
    expect(await block.getByRole('link').count()).toBe(0);

    // an engineer gets the link to the Fixtures page; screenshots at both office widths
    for (const [width, height] of [
      [1920, 1080],
      [1024, 768],
    ] as const) {
      const ctx = await browser.newContext({ baseURL: server.baseUrl, viewport: { width, height }, deviceScaleFactor: 1 });
      try {
        const p = await ctx.newPage();
        await signInAs(p, 'engineer');
        await p.goto(`/runs/${made.fail!.id}`);
        const cal = p.getByTestId('trace-calibration-record');
        await cal.getByTestId('trace-cal-certificate').waitFor();
        expect(await cal.getByRole('link', { name: 'FX-101 on the Fixtures page' }).getAttribute('href')).toBe('/fixtures');
        expect(await p.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true);
        // the traceability block with the calibration below the app bar
        await p.evaluate(() => {
          document.getElementById('trace-title')?.scrollIntoView({ block: 'start' });
          window.scrollBy(0, -76);
        });
        await screenshot(p, `run-detail-${width}`);
        if (width === 1920) {
          await cal.getByRole('link', { name: 'FX-101 on the Fixtures page' }).click();
          await p.waitForURL('**/fixtures');
          await p.getByTestId('fixture-FX-101').waitFor();
        }
      } finally {
        await ctx.close();
      }
    }
  });
});
