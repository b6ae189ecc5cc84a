import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newPage, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { signInAs } from './support/sign-in';
import { api, apiToken, unitsFor, writeSimSettings, type SimSettings, type StationUnits } from './floor-units';

/*
 * The operator station's safety and layout promises, in Chromium against the built server with the
 * simulated fixture at realistic timing (a run takes seconds, so a second scan can land during one):
 *  - a barcode scanner's burst (5 ms per key, then Enter) typed into the open "before power is applied"
 *    prompt never applies power: it cancels the prompt and becomes the next scan;
 *  - a second scan during a run is refused in its own place, and the run's verdict still fills the panel;
 *  - the screen holds its layout at 1024×768, 1440×900 and 1920×1080: nothing runs off, nothing is cut,
 *    the verdict's text sits wholly inside its panel (screenshots: docs/screenshots/station-*-<width>.png).
 */

const SIZES = [
  { width: 1024, height: 768 },
  { width: 1440, height: 900 },
  { width: 1920, height: 1080 },
] as const;

let server: StationServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let units: StationUnits;
let sim: SimSettings;
let token: string;

/** What a keyboard-wedge scanner does: the label at 5 ms per key, then Enter, into whatever has the focus. */
async function scan(serial: string): Promise<void> {
  await page.keyboard.type(serial, { delay: 5 });
  await page.keyboard.press('Enter');
}

const safetyDialog = () => page.getByRole('dialog', { name: 'Before power is applied' });

/**
 * Everything on the station screen that could run off or be cut, measured in the page: sideways scroll,
 * boxes whose content is wider than they are, text cut by an ellipsis, header items drawn over each
 * other, and any text of the result panel or the refusal strip outside its box.
 */
async function layoutProblems(): Promise<string[]> {
  return page.evaluate(() => {
    const problems: string[] = [];
    const TOL = 1;
    const doc = document.documentElement;
    if (doc.scrollWidth > doc.clientWidth + TOL) problems.push(`the page scrolls sideways (${doc.scrollWidth} > ${doc.clientWidth})`);
    const q = (sel: string) => document.querySelector<HTMLElement>(sel);
    const name = (el: Element) => `${el.tagName.toLowerCase()}${el.getAttribute('data-testid') ? `[${el.getAttribute('data-testid')}]` : ''} "${(el.textContent ?? '').trim().slice(0, 40)}"`;
    const noOverflow = (label: string, el: HTMLElement | null) => {
      if (!el) return;
      if (el.scrollWidth > el.clientWidth + TOL) problems.push(`${label} is wider than its box (${el.scrollWidth} > ${el.clientWidth})`);
      if (el.scrollHeight > el.clientHeight + TOL && getComputedStyle(el).overflowY !== 'visible') {
        problems.push(`${label} is taller than its box (${el.scrollHeight} > ${el.clientHeight})`);
      }
      const r = el.getBoundingClientRect();
      if (r.right > window.innerWidth + TOL) problems.push(`${label} runs off the right edge (${Math.round(r.right)} > ${window.innerWidth})`);
      for (const child of Array.from(el.querySelectorAll<HTMLElement>('*'))) {
        const cs = getComputedStyle(child);
        if (cs.textOverflow === 'ellipsis' && child.scrollWidth > child.clientWidth + TOL) problems.push(`text cut in ${label}: ${name(child)}`);
        if (cs.webkitLineClamp !== 'none' && cs.webkitLineClamp !== '' && child.scrollHeight > child.clientHeight + TOL) {
          problems.push(`lines cut in ${label}: ${name(child)}`);
        }
      }
    };
    /** Every piece of text inside `box` lies within its rectangle. */
    const textInside = (label: string, box: HTMLElement | null) => {
      if (!box) return;
      const outer = box.getBoundingClientRect();
      const walker = document.createTreeWalker(box, NodeFilter.SHOW_TEXT);
      for (let n = walker.nextNode(); n; n = walker.nextNode()) {
        if (!n.textContent?.trim()) continue;
        const range = document.createRange();
        range.selectNodeContents(n);
        for (const r of Array.from(range.getClientRects())) {
          if (r.width === 0 && r.height === 0) continue;
          if (r.left < outer.left - TOL || r.right > outer.right + TOL || r.top < outer.top - TOL || r.bottom > outer.bottom + TOL) {
            problems.push(`text of ${label} outside it: "${n.textContent.trim().slice(0, 40)}"`);
            break;
          }
        }
      }
    };
    const header = q('[data-testid="station-header"]');
    noOverflow('the station header', header);
    if (header) {
      // no header item drawn over another (the READY chip over the station name)
      const rects = Array.from(header.children).map((c) => ({ c, r: c.getBoundingClientRect() }));
      for (let i = 0; i < rects.length; i++) {
        for (let j = i + 1; j < rects.length; j++) {
          const a = rects[i]!.r;
          const b = rects[j]!.r;
          if (a.width && b.width && a.left < b.right - TOL && b.left < a.right - TOL && a.top < b.bottom - TOL && b.top < a.bottom - TOL) {
            problems.push(`header items overlap: ${name(rects[i]!.c)} and ${name(rects[j]!.c)}`);
          }
        }
      }
    }
    noOverflow('the scan row', q('[data-testid="scan-row"]'));
    noOverflow('the shift counters', q('aside[aria-label="This shift"]'));
    for (const sel of ['[data-testid="verdict"]', '[data-testid="ready-prompt"]', 'section[aria-label="Test in progress"]', '[data-testid="refusal"]']) {
      const el = q(sel);
      noOverflow(sel, el);
      textInside(sel, el);
    }
    return problems;
  });
}

/** At each size: nothing overflows, and a screenshot `station-<name>-<width>.png`. */
async function checkAtEverySize(name: string): Promise<void> {
  for (const size of SIZES) {
    await page.setViewportSize(size);
    await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
    await screenshot(page, `station-${name}-${size.width}`);
    expect(await layoutProblems(), `station ${name} at ${size.width}×${size.height}`).toEqual([]);
  }
}

async function runsOf(serial: string): Promise<{ id: number; verdict: string }[]> {
  const res = await api<{ items: { id: number; verdict: string }[] }>(server.baseUrl, token, `/runs?serial=${encodeURIComponent(serial)}`);
  return res.items;
}

beforeAll(async () => {
  sim = await writeSimSettings(['EOL-1']);
  [server, browser] = await Promise.all([startStationServer({ FIXTURE_SIM_TIMING: 'realistic', ...sim.env }), launchBrowser()]);
  token = await apiToken(server.baseUrl, 'operator');
  units = await unitsFor(server.baseUrl, token, 'EOL-1', sim, 3);
  ({ context, page } = await newPage(browser, server.baseUrl));
});

afterAll(async () => {
  await context?.close();
  await browser?.close();
  await server?.stop();
  await sim?.remove();
});

describe('operator station: safety prompt, verdict and layout (real browser)', () => {
  it('the ready screen holds at 1024×768, 1440×900 and 1920×1080', async () => {
    await signInAs(page, 'operator');
    await page.waitForURL('**/station');
    await page.getByRole('button', { name: /^EOL-1,/ }).click();
    await page.getByTestId('ready-prompt').waitFor();
    await page.getByTestId('shift-tested').waitFor();
    await checkAtEverySize('ready');
    await page.setViewportSize(SIZES[0]);
    await page.getByTestId('scan-field').focus();
  });

  it("a scanner's burst into the open prompt never applies power: it cancels the prompt and becomes the next scan", async () => {
    expect(units.good.length).toBeGreaterThanOrEqual(3);
    const [first, second] = units.good as [string, string];
    await scan(first);
    await safetyDialog().waitFor();
    expect(await safetyDialog().innerText()).toContain(first);
    expect(await safetyDialog().innerText()).toMatch(/Attempt 1 of \d/);
    // the operator is reading the prompt; then the next label is scanned into it (5 ms per key, Enter)
    await page.waitForTimeout(600);
    await screenshot(page, 'station-safety-1024');
    await scan(second);
    await page.waitForFunction((s) => document.querySelector('[role="dialog"]')?.textContent?.includes(s) ?? false, second, { timeout: 10_000 });
    expect(await safetyDialog().innerText()).not.toContain(first);
    // no power for the first unit: no run, no test panel
    expect(await runsOf(first)).toEqual([]);
    expect(await page.getByTestId('testing-serial').count()).toBe(0);
    // Enter (a scanner's, or a person's) still does nothing; F9 after a quiet moment starts the second unit
    await page.waitForTimeout(400);
    await page.keyboard.press('Enter');
    await page.waitForTimeout(400);
    expect(await safetyDialog().count()).toBe(1);
    expect(await runsOf(second)).toEqual([]);
    await page.keyboard.press('F9');
    await safetyDialog().waitFor({ state: 'detached' });
    await page.getByTestId('testing-serial').waitFor();
    expect(await page.getByTestId('testing-serial').innerText()).toBe(second);
    expect(await runsOf(first)).toEqual([]);
  });

  it('a second scan during the run is refused in its own place, and the verdict still fills the panel', async () => {
    const [, second, third] = units.good as [string, string, string];
    await scan(third);
    const refusal = page.getByTestId('refusal');
    await refusal.waitFor();
    expect(await refusal.getAttribute('data-refusal')).toBe('station_busy');
    expect(await page.getByTestId('testing-serial').innerText()).toBe(second);
    await checkAtEverySize('testing');
    const verdict = page.getByTestId('verdict');
    await verdict.waitFor({ timeout: 60_000 });
    expect(await page.getByTestId('verdict-word').innerText()).toBe('PASS');
    expect(await verdict.innerText()).not.toContain('busy');
    expect(await refusal.isVisible()).toBe(true);
    expect(await runsOf(third)).toEqual([]);
    expect((await runsOf(second)).map((r) => r.verdict)).toEqual(['pass']);
    await checkAtEverySize('pass');
  });

  it('a FAIL shows the attempt, what to do next, and every line of it at every size', async () => {
    await page.setViewportSize(SIZES[1]);
    await scan(units.defective);
    await safetyDialog().waitFor();
    expect(await page.getByTestId('refusal').count()).toBe(0);
    await page.waitForTimeout(450);
    await page.keyboard.press('F9');
    await page.getByTestId('verdict').waitFor({ timeout: 60_000 });
    expect(await page.getByTestId('verdict-word').innerText()).toBe('FAIL');
    expect(await page.getByTestId('verdict-attempt').innerText()).toMatch(/attempt 1 of \d/);
    expect(await page.getByTestId('verdict-advice').innerText()).toMatch(/left: re-seat the unit and test it again, or send it to repair/);
    expect(await page.getByRole('button', { name: 'Send to repair' }).count()).toBe(1);
    await checkAtEverySize('fail');
  });
});
