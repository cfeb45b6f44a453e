import { expect, type Page } from '@playwright/test';
import { demoAccounts } from '../../db/seeders/demo-accounts.mjs';

export type DemoRole = 'owner' | 'editor' | 'operator' | 'viewer';

export function demoAccount(role: DemoRole) {
  const account = demoAccounts.find((a) => a.role === role);
  if (!account) throw new Error(`no demo account for ${role}`);
  return account;
}

/** Signs in through the sign-in page as the demo user with `role`, and waits for the study list. */
export async function signInAs(page: Page, role: DemoRole) {
  const account = demoAccount(role);
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(account.email);
  await page.getByLabel('Password').fill(account.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByRole('heading', { name: 'Your studies' })).toBeVisible();
  return account;
}

/**
 * Makes a fresh account through the sign-up page (so the demo passwords stay as they are) and waits
 * for the study list. The address is then unconfirmed; pass `confirm: true` to confirm it through
 * the mailed link, as invitees must before they can accept.
 */
export async function signUpFresh(page: Page, name: string, email: string, password: string, options: { confirm?: boolean } = {}) {
  await page.goto('/sign-up');
  await page.getByLabel('Name').fill(name);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Create account' }).click();
  await expect(page.getByRole('heading', { name: 'Your studies' })).toBeVisible();
  if (options.confirm) await confirmAddress(page);
}

/** The href of the first link in the newest message of the signed-in user's mailbox whose subject matches. */
export async function linkFromMailbox(page: Page, subject: string | RegExp, linkPath: RegExp) {
  await page.goto('/mailbox');
  await expect(page.getByRole('heading', { name: 'Mailbox' })).toBeVisible();
  await page.getByTestId('mailbox-item').filter({ hasText: subject }).first().click();
  const href = await page.getByTestId('mailbox-message').getByRole('link', { name: linkPath }).first().getAttribute('href');
  expect(href).toBeTruthy();
  return href!;
}

/** Confirms the signed-in user's address with the link the mailbox holds for it. */
export async function confirmAddress(page: Page) {
  const link = await linkFromMailbox(page, 'Confirm your e-mail address', /\/confirm-email\//);
  await page.goto(link);
  await page.getByRole('button', { name: 'Confirm my address' }).click();
  await expect(page.getByRole('heading', { name: 'Address confirmed' })).toBeVisible();
}

/** Opens the seeded demo study from the study list. */
export async function openDemoStudy(page: Page) {
  await page.goto('/studies');
  await page.getByRole('link', { name: /Rainy-day savings/ }).click();
  await expect(page.getByTestId('study-title')).toContainText('Rainy-day savings');
}

export const shot = (name: string) => ({ path: `tests/artifacts/screens/${name}.png`, fullPage: true });
