import { expect, test } from '@playwright/test';
import { openDemoStudy, shot, signInAs } from './helpers';

test('an unauthenticated visitor is sent to sign in, and a wrong password is refused', async ({ page }) => {
  await page.goto('/studies');
  await expect(page).toHaveURL(/\/sign-in/);
  await page.getByLabel('E-mail').fill('emery.editor@example.org');
  await page.getByLabel('Password').fill('not-the-password');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByText('That e-mail and password do not match an account.')).toBeVisible();
  await page.screenshot(shot('sign-in-refused'));
});

test('the demo editor creates a study, finds it in the list, and signs out', async ({ page }) => {
  await signInAs(page, 'editor');
  const name = `Lunch-voucher timing ${Date.now()}`;
  await page.getByRole('link', { name: 'New study' }).click();
  await page.getByLabel('Study name').fill(name);
  await page.getByLabel('Description').fill('Do canteen vouchers paid later reverse preferences?');
  await page.getByRole('button', { name: 'Create study' }).click();
  await expect(page.getByTestId('study-title')).toHaveText(name);
  await expect(page.getByText('Your role: Owner')).toBeVisible();
  await page.screenshot(shot('study-created'));

  await page.getByRole('link', { name: '← All studies' }).click();
  await expect(page.getByRole('link', { name })).toBeVisible();
  await page.screenshot(shot('study-list'));

  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page).toHaveURL(/\/sign-in/);
  await page.goto('/studies');
  await expect(page).toHaveURL(/\/sign-in/);
});

test('the demo viewer sees the study and its members but no rename or delete control', async ({ page }) => {
  await signInAs(page, 'viewer');
  await openDemoStudy(page);
  await expect(page.getByText('Your role: Viewer')).toBeVisible();
  await expect(page.getByTestId('member-row')).toHaveCount(4, { timeout: 15_000 });
  await expect(page.getByRole('heading', { name: 'Rename' })).toHaveCount(0);
  await expect(page.getByRole('button', { name: /Delete/ })).toHaveCount(0);
  await expect(page.getByText(/not a clinical assessment/)).toBeVisible();
  await page.screenshot(shot('viewer-overview'));
});

test('the demo owner can rename the demo study and gets the rename form back', async ({ page }) => {
  await signInAs(page, 'owner');
  await openDemoStudy(page);
  await expect(page.getByRole('heading', { name: 'Rename' })).toBeVisible();
  await expect(page.getByRole('button', { name: 'Delete study…' })).toBeVisible();
  await page.screenshot(shot('owner-overview'));
});
