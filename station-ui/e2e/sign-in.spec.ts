import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newPage, screenshot } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { fillSignIn, navLinks, signInAs, type DemoRole } from './support/sign-in';

let server: StationServer;
let browser: Browser;

beforeAll(async () => {
  [server, browser] = await Promise.all([startStationServer(), launchBrowser()]);
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

// Navigation per role and start page per role, as the task brief fixes them; order is config/paths.ts.
const expectations: Record<DemoRole, { home: string; nav: string[] }> = {
  operator: { home: '/station', nav: ['Station', 'Board'] },
  engineer: { home: '/plans', nav: ['Station', 'Board', 'Repair', 'Plans', 'Limits from data', 'Fixtures', 'Lots', 'Runs', 'Quality', 'Holds and alerts', 'Audit trail'] },
  quality: { home: '/quality', nav: ['Board', 'Repair', 'Lots', 'Runs', 'Quality', 'Holds and alerts', 'Audit trail'] },
  admin: {
    home: '/admin/users',
    nav: ['Station', 'Board', 'Repair', 'Plans', 'Limits from data', 'Fixtures', 'Lots', 'Runs', 'Quality', 'Holds and alerts', 'Audit trail', 'Users'],
  },
};

describe('sign-in and navigation by role (real browser, real server)', () => {
  it('shows the sign-in page to someone not signed in', async () => {
    const { context, page } = await newPage(browser, server.baseUrl);
    try {
      await page.goto('/');
      await page.waitForURL('**/sign-in');
      await page.getByRole('heading', { name: 'Sign in' }).waitFor();
      await screenshot(page, 'sign-in');
    } finally {
      await context.close();
    }
  });

  for (const role of Object.keys(expectations) as DemoRole[]) {
    it(`${role}: lands on ${expectations[role].home} and sees exactly its navigation`, async () => {
      const { context, page } = await newPage(browser, server.baseUrl);
      try {
        await signInAs(page, role);
        await page.waitForURL(`**${expectations[role].home}`);
        expect(new URL(page.url()).pathname).toBe(expectations[role].home);
        expect(await navLinks(page)).toEqual(expectations[role].nav);
        await expect(page.getByTestId('signed-in-name').innerText()).resolves.not.toBe('');

        if (role === 'engineer') {
          await page.getByRole('heading', { name: 'Test plans' }).waitFor();
          await screenshot(page, 'shell-engineer');
        }
        if (role === 'admin') {
          const table = page.getByRole('table', { name: 'Users' });
          await table.waitFor();
          const usernames = await table.locator('tbody tr td:nth-child(2)').allInnerTexts();
          expect(usernames).toEqual(expect.arrayContaining(['admin', 'engineer', 'operator', 'quality']));
          await screenshot(page, 'admin-users');
        }
      } finally {
        await context.close();
      }
    });
  }

  it('a wrong password shows the error and keeps the person on the sign-in page', async () => {
    const { context, page } = await newPage(browser, server.baseUrl);
    try {
      await page.goto('/sign-in');
      await fillSignIn(page, 'operator', 'not-the-password');
      const alert = page.getByTestId('sign-in-error');
      await alert.waitFor();
      expect(await alert.innerText()).toContain('That user name and password do not match.');
      expect(new URL(page.url()).pathname).toBe('/sign-in');
      expect(await page.evaluate(() => localStorage.getItem('railwright.token'))).toBeNull();
    } finally {
      await context.close();
    }
  });

  it('an operator opening /admin/users sees the not-allowed page naming the admin role', async () => {
    const { context, page } = await newPage(browser, server.baseUrl);
    try {
      await signInAs(page, 'operator');
      await page.goto('/admin/users');
      await page.getByRole('heading', { name: 'Not allowed for your role' }).waitFor();
      expect(await page.getByTestId('allowed-roles').innerText()).toBe('Admin');
      expect(await page.getByRole('table', { name: 'Users' }).count()).toBe(0);
      await screenshot(page, 'not-allowed');
    } finally {
      await context.close();
    }
  });

  it('a deep link survives signing in: /runs → sign-in → back to /runs', async () => {
    const { context, page } = await newPage(browser, server.baseUrl);
    try {
      await page.goto('/runs');
      await page.waitForURL('**/sign-in?next=%2Fruns');
      await fillSignIn(page, 'quality', 'quality-demo');
      await page.waitForURL('**/runs');
      await page.getByRole('heading', { name: 'Runs' }).waitFor();
    } finally {
      await context.close();
    }
  });
});
