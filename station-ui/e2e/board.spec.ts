import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { signInAs } from './support/sign-in';
import { api, apiToken, unitsFor, writeSimSettings, type SimSettings, type StationUnits } from './floor-units';

/*
 * The wall board live, in Chromium at 1920×1080 (a wall screen) against the built server with the simulated
 * fixtures at realistic timing, so a unit can be seen under test. Runs are started through the API, as a
 * station screen elsewhere would; the board must follow without a reload.
 */

let server: StationServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let operatorToken: string;
let eol1: StationUnits;
let eol2: StationUnits;
/** FIXTURE_SIM_CONFIG for the server: in EOL-1's and EOL-2's lots one unit good, one wrong_feedback */
let sim: SimSettings;

async function startRun(units: StationUnits, serial: string): Promise<number> {
  const { run } = await api<{ run: { id: number } }>(server.baseUrl, operatorToken, `/stations/${units.stationId}/runs`, {
    method: 'POST',
    body: { serial, safetyConfirmed: true },
  });
  return run.id;
}

async function verdictMarks(code: string): Promise<(string | null)[]> {
  return page
    .getByTestId(`tile-${code}`)
    .getByRole('list', { name: 'Last verdicts, newest first' })
    .getByRole('listitem')
    .evaluateAll((li) => li.map((l) => l.getAttribute('data-verdict')));
}

beforeAll(async () => {
  sim = await writeSimSettings(['EOL-1', 'EOL-2']);
  [server, browser] = await Promise.all([startStationServer({ FIXTURE_SIM_TIMING: 'realistic', ...sim.env }), launchBrowser()]);
  operatorToken = await apiToken(server.baseUrl, 'operator');
  eol1 = await unitsFor(server.baseUrl, operatorToken, 'EOL-1', sim);
  eol2 = await unitsFor(server.baseUrl, operatorToken, 'EOL-2', sim);
  // EOL-3 blocked for the picture: its fixture taken out of service, as an engineer would
  const engineerToken = await apiToken(server.baseUrl, 'engineer');
  const fixtures = await api<{ id: number; code: string }[] | { items: { id: number; code: string }[] }>(server.baseUrl, engineerToken, '/fixtures');
  const fx103 = (Array.isArray(fixtures) ? fixtures : fixtures.items).find((f) => f.code === 'FX-103');
  if (!fx103) throw new Error('fixture FX-103 is not in the demo seed');
  await api(server.baseUrl, engineerToken, `/fixtures/${fx103.id}`, { method: 'PATCH', body: { active: false } });

  context = await browser.newContext({ baseURL: server.baseUrl, viewport: { width: 1920, height: 1080 }, deviceScaleFactor: 1 });
  page = await context.newPage();
});

afterAll(async () => {
  await context?.close();
  await browser?.close();
  await server?.stop();
  await sim?.remove();
});

describe('line board (real browser, live events)', () => {
  it('shows every station with its state and lot', async () => {
    await signInAs(page, 'operator');
    await page.goto('/board');
    for (const code of ['EOL-1', 'EOL-2', 'EOL-3']) await page.getByTestId(`tile-${code}`).waitFor();
    expect(await page.getByTestId('tile-EOL-1').innerText()).toContain('READY');
    expect(await page.getByTestId('tile-EOL-1').innerText()).toContain(eol1.lotCode);
    const eol3 = page.getByTestId('tile-EOL-3');
    expect(await eol3.innerText()).toContain('BLOCKED');
    expect(await eol3.getByRole('alert').innerText()).toContain('FX-103 is out of service');
    // set once; a reload would lose it, so it proves the updates below arrive live
    await page.evaluate(() => ((window as unknown as { boardLoadedOnce: boolean }).boardLoadedOnce = true));
  });

  it('follows a unit through its steps and adds each verdict to the row of marks', async () => {
    await startRun(eol1, eol1.good[0]!);
    await page.waitForFunction(
      (serial) => document.querySelector('[data-testid="current-EOL-1"]')?.textContent?.includes(serial) ?? false,
      eol1.good[0],
      { timeout: 10_000 },
    );
    expect(await page.getByTestId('tile-EOL-1').innerText()).toContain('TESTING');
    await page.waitForFunction(() => document.querySelector('[data-testid="current-EOL-1"]')?.textContent?.includes('No unit under test') ?? false, undefined, {
      timeout: 60_000,
    });
    expect(await verdictMarks('EOL-1')).toEqual(['pass']);

    await startRun(eol1, eol1.defective);
    await page.waitForFunction(
      () => document.querySelector('[data-testid="tile-EOL-1"] li[data-verdict="fail"]') !== null,
      undefined,
      { timeout: 60_000 },
    );
    expect(await verdictMarks('EOL-1')).toEqual(['fail', 'pass']);
    // the shift figures come from the server a moment after the verdict
    await page.waitForFunction(() => document.querySelector('[data-testid="tested-EOL-1"]')?.textContent === '2', undefined, { timeout: 15_000 });
    expect(await page.getByTestId('fpy-EOL-1').innerText()).toBe('50.0%');
    expect(await page.evaluate(() => (window as unknown as { boardLoadedOnce?: boolean }).boardLoadedOnce)).toBe(true);
  });

  it('pictures the board with a unit under test on EOL-2', async () => {
    await startRun(eol2, eol2.good[0]!);
    await page.waitForFunction(() => /Step [2-9] of/.test(document.querySelector('[data-testid="current-EOL-2"]')?.textContent ?? ''), undefined, {
      timeout: 20_000,
    });
    expect(await page.getByTestId('current-EOL-2').innerText()).toContain(eol2.good[0]);
    await screenshot(page, 'board');
    await screenshot(page, 'board-1920x1080');
    await page.waitForFunction(() => document.querySelector('[data-testid="tile-EOL-2"] li[data-verdict]') !== null, undefined, { timeout: 60_000 });
    expect(await verdictMarks('EOL-2')).toEqual(['pass']);
  });

  it('fills a 1920×1080 wall screen: the tiles reach the bottom of the screen', async () => {
    const gap = await page.evaluate(() => {
      const tiles = Array.from(document.querySelectorAll('[data-testid^="tile-"]')).map((t) => t.getBoundingClientRect());
      return window.innerHeight - Math.max(...tiles.map((r) => r.bottom));
    });
    // the board's own padding is all that is left under the tiles (it was half the screen)
    expect(gap).toBeGreaterThanOrEqual(0);
    expect(gap).toBeLessThan(60);
  });

  it('keeps every tile on a 1600×1000 screen with a blocked station', async () => {
    await page.setViewportSize({ width: 1600, height: 1000 });
    // EOL-2's shift figures follow its verdict from the server a moment later; picture them settled
    await page.waitForFunction(() => document.querySelector('[data-testid="tested-EOL-2"]')?.textContent === '1', undefined, { timeout: 15_000 });
    const eol3 = page.getByTestId('tile-EOL-3');
    expect(await eol3.innerText()).toContain('BLOCKED');
    const outside = await page.evaluate(() =>
      Array.from(document.querySelectorAll('[data-testid^="tile-"]'))
        .map((t) => ({ id: t.getAttribute('data-testid'), r: t.getBoundingClientRect() }))
        .filter(({ r }) => r.bottom > window.innerHeight + 0.5 || r.right > window.innerWidth + 0.5)
        .map(({ id }) => id),
    );
    expect(outside).toEqual([]);
    await screenshot(page, 'board-1600x1000');
    await page.setViewportSize({ width: 1920, height: 1080 });
  });

  it('runs on a wall screen from a display link: no sign-in page, the board alone, units with their times', async () => {
    // any token the board route accepts does for the screen's part; the server issues board-only ones
    const wall = await browser.newContext({ baseURL: server.baseUrl, viewport: { width: 1920, height: 1080 }, deviceScaleFactor: 1 });
    const wallPage = await wall.newPage();
    try {
      await wallPage.goto(`/board?display=${encodeURIComponent(operatorToken)}`);
      await wallPage.getByTestId('tile-EOL-1').waitFor();
      expect(new URL(wallPage.url()).pathname).toBe('/board');
      expect(await wallPage.locator('[data-display="wall"]').count()).toBe(1);
      const times = await wallPage.getByTestId('tile-EOL-1').getByTestId('recent-time').allInnerTexts();
      expect(times.length).toBeGreaterThan(0);
      for (const t of times) expect(t).toMatch(/^\d\d:\d\d$/);
      // kept for the next start of the screen, without the address
      await wallPage.goto('/board');
      await wallPage.getByTestId('tile-EOL-1').waitFor();
      expect(new URL(wallPage.url()).pathname).toBe('/board');
      // a refused token: the screen says so and stays on the board's address
      await wallPage.goto('/board?display=not-a-token');
      await wallPage.getByText('Board link expired — ask an administrator for a new one').waitFor();
      expect(new URL(wallPage.url()).pathname).toBe('/board');
    } finally {
      await wall.close();
    }
  });
});
