import type { Page } from 'playwright-core';

/** The demo sign-ins of docs/architecture.md. */
export const demoUsers = {
  operator: { username: 'operator', password: 'operator-demo' },
  engineer: { username: 'engineer', password: 'engineer-demo' },
  quality: { username: 'quality', password: 'quality-demo' },
  admin: { username: 'admin', password: 'admin-demo' },
} as const;

export type DemoRole = keyof typeof demoUsers;

/** Fills the sign-in form the way a person does (labels, not selectors) and submits it. */
export async function fillSignIn(page: Page, username: string, password: string): Promise<void> {
  await page.getByLabel('User name').fill(username);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

export async function signInAs(page: Page, role: DemoRole): Promise<void> {
  await page.goto('/sign-in');
  await fillSignIn(page, demoUsers[role].username, demoUsers[role].password);
  await page.locator('nav[aria-label="Main"]').waitFor();
}

/** The link texts of the main navigation, in order. */
export async function navLinks(page: Page): Promise<string[]> {
  const texts = await page.locator('nav[aria-label="Main"] a').allInnerTexts();
  return texts.map((t) => t.trim());
}
