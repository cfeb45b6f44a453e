import { expect, test } from '@playwright/test';
import { confirmAddress, linkFromMailbox, openDemoStudy, shot, signInAs, signUpFresh } from './helpers';

test('the demo owner invites an address, and the invitee confirms the address and joins through the mailed link with the invited role', async ({ page, browser }) => {
  test.setTimeout(120_000);
  const email = `invitee-${Date.now()}@harbourlight.example.org`;
  await signInAs(page, 'owner');
  await openDemoStudy(page);
  await page.getByRole('link', { name: 'Team' }).first().click();
  await expect(page.getByRole('heading', { name: 'Invite someone' })).toBeVisible();

  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Role', { exact: true }).selectOption('editor');
  await page.getByRole('button', { name: 'Send invitation' }).click();
  await expect(page.getByText('Invitation sent')).toBeVisible();
  await expect(page.getByTestId('invitation-row').filter({ hasText: email })).toContainText('Editor');
  await page.screenshot(shot('team-invited'));

  // The owner's mailbox holds only the owner's mail: the invitation is not there for them to read.
  await page.getByTestId('mailbox-link').click();
  await expect(page.getByRole('heading', { name: 'Mailbox' })).toBeVisible();
  await expect(page.getByTestId('mailbox-item').filter({ hasText: email })).toHaveCount(0);

  // The invitee has never been here: a fresh browser context, a new account with the invited address.
  const invitee = await browser.newContext();
  const guest = await invitee.newPage();
  await signUpFresh(guest, 'Marlowe Quist', email, 'harbour-invitee-2026');
  const link = await linkFromMailbox(guest, /^Join /, /\/invitations\//);
  await guest.screenshot(shot('mailbox-invitation'));
  await guest.goto(link);
  await expect(guest.getByText(/You are invited to join/)).toContainText('as editor');
  // Until the address is confirmed, the invitation cannot be accepted.
  await expect(guest.getByTestId('address-unconfirmed')).toContainText('Your address is not confirmed yet');
  await expect(guest.getByRole('button', { name: 'Accept and open the study' })).toHaveCount(0);
  await guest.screenshot(shot('invitation-landing'));
  await confirmAddress(guest);

  await guest.goto(link);
  await expect(guest.getByRole('button', { name: 'Accept and open the study' })).toBeVisible();
  await guest.getByRole('button', { name: 'Accept and open the study' }).click();
  await expect(guest.getByTestId('study-title')).toContainText('Rainy-day savings');
  await expect(guest.getByText('Your role: Editor')).toBeVisible();
  await guest.screenshot(shot('invitee-joined'));

  // The link worked once: opening it again says so instead of failing.
  await guest.goto(link);
  await expect(guest.getByRole('heading', { name: 'Invitation already used' })).toBeVisible();

  // The owner sees the new member and the trail of what happened; then removes them again, so the
  // demo study keeps its seeded team for other specs.
  await page.goto(new URL(link).origin + '/studies');
  await openDemoStudy(page);
  await page.getByRole('link', { name: 'Audit trail' }).click();
  await expect(page.getByRole('heading', { name: 'Audit trail' })).toBeVisible({ timeout: 30_000 });
  await page.getByLabel('What').selectOption('invitation.accept');
  await expect(page.getByTestId('audit-row').filter({ hasText: email }).first()).toContainText('Invitation accepted');
  await page.screenshot(shot('audit-trail'));
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download CSV' }).click()]);
  expect(download.suggestedFilename()).toMatch(/^study-\d+-audit-trail\.csv$/);
  await page.getByRole('link', { name: 'Team' }).first().click();
  const row = page.getByTestId('team-member-row').filter({ hasText: email });
  await expect(row).toContainText('Marlowe Quist');
  await row.getByRole('button', { name: 'Remove' }).click();
  await row.getByRole('button', { name: 'Remove now' }).click();
  await expect(page.getByTestId('team-member-row').filter({ hasText: email })).toHaveCount(0);
  await invitee.close();
});

test('a forgotten password is reset through the mailed link, and the request page answers the same for any address', async ({ page, browser }) => {
  test.setTimeout(120_000);
  const email = `resetter-${Date.now()}@harbourlight.example.org`;
  await signUpFresh(page, 'Ren Aldous', email, 'first-password-2026');

  const guest = await (await browser.newContext()).newPage();
  await guest.goto('/sign-in');
  await guest.getByRole('link', { name: 'Forgot your password?' }).click();
  await expect(guest.getByRole('heading', { name: 'Forgot your password?' })).toBeVisible();
  await guest.getByLabel('E-mail').fill(`nobody-${Date.now()}@harbourlight.example.org`);
  await guest.getByRole('button', { name: 'Send the link' }).click();
  const answer = (await guest.getByRole('status').filter({ hasText: 'Check your inbox' }).textContent()) ?? '';
  expect(answer).toContain('If an account uses this address');
  await guest.goto('/forgot-password');
  await guest.getByLabel('E-mail').fill(email);
  await guest.getByRole('button', { name: 'Send the link' }).click();
  await expect(guest.getByRole('status').filter({ hasText: 'Check your inbox' })).toHaveText(answer);
  await guest.screenshot(shot('reset-requested'));

  const link = await linkFromMailbox(page, 'Choose a new Switchback password', /\/reset-password\//);
  await guest.goto(link);
  await expect(guest.getByRole('heading', { name: 'Choose a new password' })).toBeVisible();
  await guest.getByLabel('New password').fill('second-password-2026');
  await guest.getByLabel('The same again').fill('second-password-2026');
  await guest.getByRole('button', { name: 'Save the new password' }).click();
  await expect(guest.getByRole('heading', { name: 'Password changed' })).toBeVisible();

  await guest.getByRole('link', { name: 'Sign in' }).click();
  await expect(guest.getByRole('heading', { name: 'Sign in' })).toBeVisible();
  await guest.getByLabel('E-mail').fill(email);
  await guest.getByLabel('Password').fill('second-password-2026');
  await guest.getByRole('button', { name: 'Sign in' }).click();
  await expect(guest.getByRole('heading', { name: 'Your studies' })).toBeVisible();

  await guest.goto(link);
  await expect(guest.getByRole('heading', { name: 'This link cannot be used' })).toBeVisible();
  await guest.screenshot(shot('reset-link-used'));

  // The session that was open before the reset has ended.
  await page.goto('/studies');
  await expect(page.getByRole('heading', { name: 'Sign in' })).toBeVisible();
});

test('a signed-in user changes their password on the account page, is signed out everywhere, and signs in with the new one', async ({ page, browser }) => {
  const email = `changer-${Date.now()}@harbourlight.example.org`;
  await signUpFresh(page, 'Sol Marden', email, 'first-password-2026');
  // a second device, signed in as well
  const other = await (await browser.newContext()).newPage();
  await other.goto('/sign-in');
  await other.getByLabel('E-mail').fill(email);
  await other.getByLabel('Password').fill('first-password-2026');
  await other.getByRole('button', { name: 'Sign in' }).click();
  await expect(other.getByRole('heading', { name: 'Your studies' })).toBeVisible();

  await page.getByRole('link', { name: 'Account' }).click();
  await page.getByLabel('Current password').fill('not-my-password');
  await page.getByLabel('New password', { exact: true }).fill('second-password-2026');
  await page.getByLabel('New password again').fill('second-password-2026');
  await page.getByRole('button', { name: 'Change password' }).click();
  await expect(page.getByText('This is not your current password.')).toBeVisible();
  await page.getByLabel('Current password').fill('first-password-2026');
  await page.getByRole('button', { name: 'Change password' }).click();
  await expect(page.getByText('Password changed')).toBeVisible();
  await page.screenshot(shot('account-password-changed'));

  await other.goto('/studies');
  await expect(other.getByRole('heading', { name: 'Sign in' })).toBeVisible();
  await page.getByRole('button', { name: 'Sign in again' }).click();
  await expect(page.getByRole('heading', { name: 'Sign in' })).toBeVisible();
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill('second-password-2026');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByRole('heading', { name: 'Your studies' })).toBeVisible();
});

test('a withdrawn invitation link says so instead of failing', async ({ page, browser }) => {
  const email = `withdrawn-${Date.now()}@harbourlight.example.org`;
  const guest = await (await browser.newContext()).newPage();
  await signUpFresh(guest, 'Wren Halloway', email, 'harbour-withdrawn-2026');

  await signInAs(page, 'owner');
  await openDemoStudy(page);
  await page.getByRole('link', { name: 'Team' }).first().click();
  await page.getByLabel('E-mail').fill(email);
  await page.getByRole('button', { name: 'Send invitation' }).click();
  const row = page.getByTestId('invitation-row').filter({ hasText: email });
  await expect(row).toBeVisible();
  const link = await linkFromMailbox(guest, /^Join /, /\/invitations\//);

  await row.getByRole('button', { name: 'Withdraw' }).click();
  await expect(page.getByText(`The invitation for ${email} was withdrawn`)).toBeVisible();
  await expect(page.getByTestId('invitation-row').filter({ hasText: email })).toHaveCount(0);

  await guest.goto(link);
  await expect(guest.getByRole('heading', { name: 'Invitation withdrawn' })).toBeVisible();
  await expect(guest.getByText('This invitation was withdrawn by the study owner.')).toBeVisible();
  await guest.screenshot(shot('invitation-withdrawn'));
});
