import { expect, test } from '@playwright/test';
import { demoAccount, shot, signUpFresh } from './helpers';

test('signing out ends the session on the server: a copy of its cookie stops working', async ({ page, browser }) => {
  const email = `leaver-${Date.now()}@harbourlight.example.org`;
  await signUpFresh(page, 'Teodor Brisk', email, 'harbour-leaver-2026');
  const cookies = await page.context().cookies();
  expect(cookies.some((c) => c.name.endsWith('next-auth.session-token'))).toBe(true);

  // Someone copied the cookie while the session was open.
  const copy = await browser.newContext();
  await copy.addCookies(cookies);
  expect((await copy.request.get('/api/studies')).status()).toBe(200);

  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page.getByRole('heading', { name: 'Sign in' })).toBeVisible();
  expect((await copy.request.get('/api/studies')).status()).toBe(401);
  const stale = await copy.newPage();
  await stale.goto('/studies');
  await expect(stale.getByRole('heading', { name: 'Sign in' })).toBeVisible();
  await copy.close();
});

test('sign-up answers an address that has an account as it answers a new one, and signs nobody in', async ({ page }) => {
  const known = demoAccount('viewer').email;
  await page.goto('/sign-up');
  await page.getByLabel('Name').fill('Not The Owner');
  await page.getByLabel('E-mail').fill(known);
  await page.getByLabel('Password').fill('someone-elses-guess-2026');
  await page.getByRole('button', { name: 'Create account' }).click();
  const answer = page.getByRole('status').filter({ hasText: 'Check your inbox' });
  await expect(answer).toContainText('We sent a message to this address with a link to confirm it.');
  await page.screenshot(shot('sign-up-known-address'));
  expect((await page.request.get('/api/studies')).status()).toBe(401);
});
