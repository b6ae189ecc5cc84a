import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newPage } from './support/browser';
import { startStationServer, type StationServer } from './support/server';
import { fillSignIn, navLinks, signInAs } from './support/sign-in';

let server: StationServer;
let browser: Browser;

beforeAll(async () => {
  [server, browser] = await Promise.all([startStationServer(), launchBrowser()]);
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

function row(page: Page, username: string) {
  return page.getByRole('table', { name: 'Users' }).locator('tbody tr', { hasText: username });
}

describe('admin → users against the real server', () => {
  it('adds a user, refuses a taken name, changes roles, resets the password, deactivates and reactivates', async () => {
    const admin = await newPage(browser, server.baseUrl);
    const person = await newPage(browser, server.baseUrl);
    try {
      const page = admin.page;
      await signInAs(page, 'admin');
      await page.getByRole('table', { name: 'Users' }).waitFor();

      // Add a user; the dialog checks the fields before sending.
      await page.getByRole('button', { name: 'Add user' }).click();
      const dialog = page.getByRole('dialog', { name: 'Add a user' });
      await dialog.getByRole('button', { name: 'Add user' }).click();
      await dialog.getByText('Pick at least one role.').waitFor();
      await dialog.getByRole('textbox', { name: 'Name', exact: true }).fill('J. Okafor');
      await dialog.getByLabel('User name').fill('j.okafor');
      await dialog.getByLabel('First password').fill('first-pass-1');
      await dialog.getByLabel('Operator', { exact: true }).check();
      await dialog.getByRole('button', { name: 'Add user' }).click();
      await dialog.waitFor({ state: 'hidden' });
      await row(page, 'j.okafor').waitFor();
      expect(await row(page, 'j.okafor').innerText()).toContain('OPERATOR');

      // The same user name again: the server's username_taken refusal, shown beside the field.
      await page.getByRole('button', { name: 'Add user' }).click();
      await dialog.getByRole('textbox', { name: 'Name', exact: true }).fill('Someone Else');
      await dialog.getByLabel('User name').fill('j.okafor');
      await dialog.getByLabel('First password').fill('another-pass');
      await dialog.getByLabel('Quality', { exact: true }).check();
      await dialog.getByRole('button', { name: 'Add user' }).click();
      await dialog.getByText('“j.okafor” is already taken. Choose another user name.').waitFor();
      await dialog.getByRole('button', { name: 'Cancel' }).click();

      // Add the quality role.
      await page.getByRole('button', { name: 'Edit J. Okafor' }).click();
      const edit = page.getByRole('dialog', { name: 'Edit J. Okafor' });
      await edit.getByLabel('Quality', { exact: true }).check();
      await edit.getByRole('button', { name: 'Save changes' }).click();
      await edit.waitFor({ state: 'hidden' });
      await row(page, 'j.okafor').getByText('Quality', { exact: true }).waitFor();

      // New password, typed twice.
      await page.getByRole('button', { name: 'New password for J. Okafor' }).click();
      const pw = page.getByRole('dialog', { name: 'New password for J. Okafor' });
      await pw.getByLabel('New password').fill('second-pass-2');
      await pw.getByLabel('Repeat it').fill('second-pass-2');
      await pw.getByRole('button', { name: 'Set password' }).click();
      await pw.waitFor({ state: 'hidden' });

      // Deactivate: the person cannot sign in, and is told why (the password was right).
      await page.getByRole('button', { name: 'Deactivate J. Okafor' }).click();
      await page.getByRole('dialog', { name: 'Deactivate this user?' }).getByRole('button', { name: 'Deactivate' }).click();
      await row(page, 'j.okafor').getByText('Deactivated', { exact: true }).waitFor();

      await person.page.goto('/sign-in');
      await fillSignIn(person.page, 'j.okafor', 'second-pass-2');
      await person.page.getByTestId('sign-in-error').getByText(/deactivated/i).waitFor();

      // Reactivate; the new password works and both roles' pages are there.
      await page.getByRole('button', { name: 'Reactivate J. Okafor' }).click();
      await row(page, 'j.okafor').getByText('Active', { exact: true }).waitFor();
      await fillSignIn(person.page, 'j.okafor', 'second-pass-2');
      await person.page.waitForURL('**/station');
      await person.page.locator('nav[aria-label="Main"]').waitFor();
      expect(await navLinks(person.page)).toEqual(['Station', 'Board', 'Repair', 'Lots', 'Runs', 'Quality', 'Holds and alerts', 'Audit trail']);
    } finally {
      await admin.context.close();
      await person.context.close();
    }
  });

  it('refuses to take the admin role from the last administrator, and says why', async () => {
    const { context, page } = await newPage(browser, server.baseUrl);
    try {
      await signInAs(page, 'admin');
      await page.getByRole('button', { name: /^Edit Admin/ }).click();
      const edit = page.getByRole('dialog');
      await edit.getByLabel('Admin', { exact: true }).uncheck();
      await edit.getByLabel('Operator', { exact: true }).check();
      await edit.getByRole('button', { name: 'Save changes' }).click();
      await edit.getByRole('alert').getByText(/last active administrator/).waitFor();
    } finally {
      await context.close();
    }
  });

  it('the audit trail lists failed sign-ins in words when filtered by action, and keeps the filter in the address', async () => {
    // Make sure there is at least one failed sign-in, whatever ran before.
    const refused = await fetch(`${server.baseUrl}/api/auth/login`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ username: 'quality', password: 'not-it' }),
    });
    expect(refused.status).toBe(401);

    const { context, page } = await newPage(browser, server.baseUrl);
    try {
      await signInAs(page, 'admin');
      await page.getByRole('link', { name: 'Audit trail' }).click();
      const table = page.getByRole('table', { name: 'Audit records' });
      await table.waitFor();
      // a link can point at a filtered view: the action filter comes from the address
      await page.goto('/audit?action=auth.login_failed');
      const whatCells = table.locator('tbody tr td:nth-child(4)');
      await expect
        .poll(async () => [...new Set((await whatCells.allInnerTexts()).map((a) => a.trim().replace(/"[^"]*"/, '"…"')))], { timeout: 10_000 })
        .toEqual(['Refused a sign-in as "…"']);
      expect(await table.locator('tbody tr', { hasText: 'Refused a sign-in as "quality"' }).count()).toBeGreaterThan(0);
    } finally {
      await context.close();
    }
  });
});
