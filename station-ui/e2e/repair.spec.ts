import { writeFile } from 'node:fs/promises';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { signInAs } from './support/sign-in';
import { api, apiToken, FORCED_DEFECT, unitsFor, writeSimSettings, type SimSettings, type StationUnits } from './floor-units';

/*
 * The Repair page in Chromium (issue 12): failed units from real runs on EOL-1 wait in the queue; an engineer
 * scans a repair tag's serial into the page's box, receives the unit, records its repair with a cause and
 * returns it for retest. The page is checked at 1024 px, where the state label was once cut to "W…".
 */

/** How many more units of EOL-1's lot the simulator makes defective (besides floor-units' one). */
const EXTRA_DEFECTIVE = 7;

interface RunView {
  id: number;
  verdict: string;
}
interface RepairRecordView {
  serial: string;
  cause: { name: string };
  symptom: string;
  actionTaken: string;
  disposition: string;
  technician: { displayName: string };
}

let server: StationServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let sim: SimSettings;
let units: StationUnits;
let defective: string[] = [];
let engineer: string;

async function testUnit(token: string, serial: string): Promise<RunView> {
  const started = await api<{ run: RunView }>(server.baseUrl, token, `/stations/${units.stationId}/runs`, { method: 'POST', body: { serial, safetyConfirmed: true } });
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    const run = await api<RunView>(server.baseUrl, token, `/runs/${started.run.id}`);
    if (run.verdict !== 'running') return run;
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`run of ${serial} did not finish:\n${server.output()}`);
}

beforeAll(async () => {
  sim = await writeSimSettings(['EOL-1']);
  // more wrong_feedback units of the same lot (same serial form as the one floor-units marks), so the queue has rows
  const marked = Object.entries(sim.config.serials ?? {}).filter(([, c]) => c === FORCED_DEFECT).map(([s]) => s);
  for (const serial of marked) {
    for (let i = 1; i <= EXTRA_DEFECTIVE; i++) sim.config.serials![`${serial.slice(0, -5)}${String(2 + i).padStart(5, '0')}`] = FORCED_DEFECT;
  }
  await writeFile(sim.env.FIXTURE_SIM_CONFIG, `${JSON.stringify(sim.config, null, 2)}\n`);
  [server, browser] = await Promise.all([startStationServer(sim.env), launchBrowser()]);
  const operator = await apiToken(server.baseUrl, 'operator');
  engineer = await apiToken(server.baseUrl, 'engineer');
  units = await unitsFor(server.baseUrl, operator, 'EOL-1', sim);
  const prefix = units.defective.slice(0, -5);
  defective = [units.defective, ...Array.from({ length: EXTRA_DEFECTIVE }, (_, i) => `${prefix}${String(3 + i).padStart(5, '0')}`)];
  for (const serial of defective) {
    expect((await testUnit(operator, serial)).verdict).toBe('fail');
    await api(server.baseUrl, operator, `/units/${serial}/send-to-repair`, { method: 'POST', body: { note: 'Output voltage off' } });
  }
  // earlier repairs, so the Pareto by cause has bars: three units repaired and returned, two on the bench
  const causes = await api<{ id: number; name: string }[]>(server.baseUrl, engineer, '/repair-causes');
  const causeId = (name: string) => causes.find((c) => c.name === name)!.id;
  const repaired: [string, string][] = [
    [defective[5]!, 'Feedback divider out of tolerance'],
    [defective[6]!, 'Feedback divider out of tolerance'],
    [defective[7]!, 'Wrong component value'],
  ];
  for (const [serial, cause] of repaired) {
    await api(server.baseUrl, engineer, `/units/${serial}/repair`, { method: 'POST', body: { action: 'receive', note: 'bench 1' } });
    await api(server.baseUrl, engineer, `/units/${serial}/repair`, {
      method: 'POST',
      body: { action: 'return', symptom: 'Output voltage high at every load', causeId: causeId(cause), actionTaken: 'Replaced the lower feedback resistor' },
    });
  }
  for (const serial of defective.slice(3, 5)) {
    await api(server.baseUrl, engineer, `/units/${serial}/repair`, { method: 'POST', body: { action: 'receive', note: 'bench 2' } });
  }
  context = await browser.newContext({ baseURL: server.baseUrl, viewport: { width: 1024, height: 768 }, deviceScaleFactor: 1 });
  page = await context.newPage();
});

afterAll(async () => {
  await context?.close();
  await browser?.close();
  await server?.stop();
  await sim?.remove();
});

/** Labels in the queue whose text does not fit their box (cut with an ellipsis), e.g. "W…". */
const cutLabels = (p: Page) =>
  p.locator('table[aria-label="Repair queue"] .mantine-Badge-label').evaluateAll((els) => els.filter((e) => e.scrollWidth > e.clientWidth + 1).map((e) => e.textContent));

describe('repair page (real browser)', () => {
  it('shows the queue at 1024 px with every state label readable and serials linking to the unit history', async () => {
    await signInAs(page, 'engineer');
    await page.goto('/repair');
    const rows = page.locator('table[aria-label="Repair queue"] tbody tr');
    await rows.first().waitFor();
    expect(await rows.count()).toBe(5);
    const states = await page.locator('table[aria-label="Repair queue"] .mantine-Badge-label').allTextContents();
    expect(states.sort()).toEqual(['On the bench', 'On the bench', 'Waiting', 'Waiting', 'Waiting']);
    // issue 12: the state label was cut to "W…" at 1024 px
    expect(await cutLabels(page)).toEqual([]);
    expect(await page.getByRole('link', { name: defective[0] }).getAttribute('href')).toBe(`/units/${defective[0]}`);
    await page.getByRole('table', { name: 'Pareto by cause' }).waitFor();
    expect(await page.getByRole('table', { name: 'Pareto by cause' }).locator('tbody tr').first().innerText()).toContain('Feedback divider out of tolerance');
    await screenshot(page, 'repair-1024');
  });

  it('finds a unit when its repair tag is scanned into the box (keystrokes, lower case, then Enter)', async () => {
    const box = page.getByRole('textbox', { name: /Scan or type a serial/ });
    await box.click();
    // a scanner types fast and ends with Enter; lower case too, as some scanners send it
    await box.pressSequentially(defective[0]!.toLowerCase(), { delay: 5 });
    await box.press('Enter');
    await page.waitForFunction((serial) => {
      const trs = document.querySelectorAll('table[aria-label="Repair queue"] tbody tr');
      return trs.length === 1 && trs[0]?.getAttribute('data-serial') === serial;
    }, defective[0]);
  });

  it('receives the unit, records its repair with a cause and returns it for retest', async () => {
    await page.getByRole('button', { name: `Receive ${defective[0]}` }).click();
    const receive = page.getByRole('dialog', { name: `Receive into repair: ${defective[0]}` });
    await receive.getByRole('textbox', { name: /Repair note/ }).fill('On bench 2, output high');
    await receive.getByRole('button', { name: 'Receive' }).click();
    await receive.waitFor({ state: 'detached' });
    await page.locator(`table[aria-label="Repair queue"] tbody tr[data-serial="${defective[0]}"]`).getByText('On the bench').waitFor();

    await page.getByRole('button', { name: `Record repair ${defective[0]}` }).click();
    const form = page.getByRole('dialog', { name: `Record repair: ${defective[0]}` });
    await form.getByRole('textbox', { name: /Symptom/ }).fill('Output 5.6 V at every load');
    await form.getByRole('combobox', { name: /Cause/ }).click();
    await page.getByRole('option', { name: 'Solder bridge' }).click();
    await form.getByRole('textbox', { name: /Action taken/ }).fill('Removed a bridge across the feedback divider');
    expect(await form.getByRole('radio', { name: /Eligible for retest/ }).isChecked()).toBe(true);
    await screenshot(page, 'repair-record-1024');
    await form.getByRole('button', { name: 'Record and return for retest' }).click();
    await form.waitFor({ state: 'detached' });
    await page.getByText(`No unit in the repair queue matches “${defective[0]!.toLowerCase()}”.`).waitFor();

    const records = await api<{ items: RepairRecordView[] }>(server.baseUrl, engineer, `/repair-records?serial=${defective[0]}`);
    expect(records.items).toHaveLength(1);
    expect(records.items[0]).toMatchObject({
      serial: defective[0],
      cause: { name: 'Solder bridge' },
      symptom: 'Output 5.6 V at every load',
      actionTaken: 'Removed a bridge across the feedback divider',
      disposition: 'retest',
      technician: { displayName: 'Test engineer' },
    });
    const unit = await api<{ state: string }>(server.baseUrl, engineer, `/units/${defective[0]}`);
    expect(unit.state).toBe('untested');
  });

  it('reads well at 1920 px too', async () => {
    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.getByRole('textbox', { name: /Scan or type a serial/ }).fill('');
    await page.getByRole('textbox', { name: /Scan or type a serial/ }).press('Enter');
    const rows = page.locator('table[aria-label="Repair queue"] tbody tr');
    await page.waitForFunction(() => document.querySelectorAll('table[aria-label="Repair queue"] tbody tr').length === 4);
    expect(await rows.count()).toBe(4);
    expect(await cutLabels(page)).toEqual([]);
    await page.getByRole('table', { name: 'Pareto by cause' }).getByText('Solder bridge').waitFor();
    // the "returned for retest" message closes by itself; the picture shows the page under it
    await page.waitForFunction(() => document.querySelectorAll('.mantine-Notification-root').length === 0, undefined, { timeout: 15_000 });
    await screenshot(page, 'repair-1920');
  });
});
