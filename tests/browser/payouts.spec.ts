import { readFileSync } from 'node:fs';
import { expect, test, type APIRequestContext } from '@playwright/test';
import { openDemoStudy, shot, signInAs } from './helpers';

// Real rewards in the browser: the owner turns them on for a frozen version on the payouts page,
// participants complete their sessions through the session API (a server key) and are told what
// they will be paid and when; the ledger lists them (held without payment details, or above the
// approval threshold), filters by status, exports CSV with the caution, and the owner approves one
// payout and cancels another with a reason.

type Item = { id: string; role: string; magnitude: string | null; soonerAmount: number; laterAmount: number; laterDelay: number };

/** Runs one participant through both blocks with a server key; returns the reply to the last stage-2 answers. */
async function complete(request: APIRequestContext, studyId: string, secret: string, itemBankId: string, participantId: string) {
  const headers = { authorization: `Bearer ${secret}` };
  const block = await request.get(`/api/v1/studies/${studyId}/calibration?participantId=${participantId}`, { headers });
  expect(block.status()).toBe(200);
  const responses: Record<string, string> = {};
  for (const item of (await block.json()).items as Item[]) {
    if (item.role !== 'calibration') continue;
    const k = item.magnitude === 'small' ? 0.05 : 0.01; // a hyperbolic chooser (invented demo rates)
    responses[item.id] = item.laterAmount / (1 + k * item.laterDelay) > item.soonerAmount ? 'later' : 'sooner';
  }
  const served = await request.post(`/api/v1/studies/${studyId}/probe-items`, { headers, data: { participantId, responses, itemBankId } });
  expect(served.status()).toBe(200);
  const answers = ((await served.json()).items as Item[]).map((item, i) => ({ itemId: item.id, chosen: i % 2 ? 'later' : 'sooner' }));
  const reply = await request.post(`/api/v1/studies/${studyId}/stage2-answers`, { headers, data: { participantId, answers } });
  expect(reply.status()).toBe(200);
  return reply.json();
}

test('the owner turns real rewards on, participants are told their payment, and the ledger lists, filters, exports, approves and cancels', async ({ page, request }) => {
  test.setTimeout(120_000);
  await signInAs(page, 'owner');
  await openDemoStudy(page);
  const studyId = new URL(page.url()).pathname.split('/')[2];

  // A server key for the lab's software, on a personalised frozen version.
  await page.getByRole('link', { name: 'API', exact: true }).click();
  await page.getByLabel('Key name').fill(`Payout software ${Date.now()}`);
  const versionOption = page.getByLabel('Serves frozen version').locator('option', { hasText: 'personalised' }).first();
  const versionId = (await versionOption.getAttribute('value'))!;
  await page.getByLabel('Serves frozen version').selectOption(versionId);
  await page.getByRole('button', { name: 'Create key' }).click();
  const secret = (await page.getByTestId('new-secret').textContent())!.trim();
  expect(secret).toMatch(/^sbk_/);
  const keys = await page.request.get(`/api/studies/${studyId}/api-keys`);
  const itemBankId = ((await keys.json()).keys as Array<{ prefix: string; itemBankId: string }>).find((k) => secret.startsWith(k.prefix))!.itemBankId;

  // Real rewards on for that version, with an approval threshold of 1 (so every payout waits for an owner).
  await page.getByRole('link', { name: 'Payouts', exact: true }).click();
  await expect(page.getByText('Real rewards are for your ethics board to approve')).toBeVisible();
  const settings = page.getByTestId(`reward-settings-${versionId}`);
  await settings.getByRole('checkbox').check();
  await settings.getByLabel(/Approval threshold/).fill('1');
  await settings.getByRole('button', { name: 'Save' }).click();
  await expect(settings.getByText('Saved.')).toBeVisible();

  const stamp = Date.now();
  const held = `PAY-${stamp}-a`;
  const approved = `PAY-${stamp}-b`;
  const first = await complete(request, studyId, secret, itemBankId, held);
  expect(first.status).toBe('completed');
  expect(first.reward.message).toMatch(/^One of your choices was drawn and is paid as you chose it: EUR \d+\.\d{2}, due /);
  const details = await request.post(`/api/v1/studies/${studyId}/payment-details`, { headers: { authorization: `Bearer ${secret}` }, data: { participantId: approved, email: 'participant-b@harbourlight.example' } });
  expect(details.status()).toBe(200);
  await complete(request, studyId, secret, itemBankId, approved);

  await page.reload();
  const rows = page.getByTestId('payout-row');
  await page.getByLabel('Participant contains').fill(`PAY-${stamp}`);
  await expect(rows).toHaveCount(2);
  const heldRow = rows.filter({ hasText: held });
  const approvedRow = rows.filter({ hasText: approved });
  await expect(heldRow).toContainText('held');
  await expect(heldRow).toContainText('no payment details');
  await expect(approvedRow).toContainText('needs approval');

  // CSV export: the caution first, through the one writer.
  const csv = await page.request.get(`/api/studies/${studyId}/payouts?participant=PAY-${stamp}&format=csv`);
  const text = await csv.text();
  expect(text.split('\r\n')[0]).toMatch(/^# Real rewards must follow/);
  expect(text).toContain(held);

  // The owner approves one payout and cancels the other, with a reason.
  await approvedRow.getByRole('checkbox').check();
  await page.getByRole('button', { name: 'Approve' }).click();
  await expect(approvedRow).toContainText('scheduled');
  await expect(approvedRow).toContainText('approved');
  await heldRow.getByRole('checkbox').check();
  await page.getByLabel('Reason for cancelling').fill('participant withdrew');
  await page.getByRole('button', { name: 'Cancel payouts' }).click();
  await expect(heldRow).toContainText('cancelled: participant withdrew');
  await page.getByLabel('Status').selectOption('cancelled');
  await expect(rows.filter({ hasText: `PAY-${stamp}` })).toHaveCount(1);
  await page.getByLabel('Status').selectOption('');
  await expect(page.getByTestId('payout-totals')).toContainText('cancelled');
  await page.screenshot(shot('payouts-ledger'));

  // The audit trail names both owner actions.
  await page.getByRole('link', { name: 'Audit trail' }).click();
  await expect(page.getByText('Cancelled 1 payout(s)').first()).toBeVisible();
  await expect(page.getByText('Approved 1 payout(s) above the threshold').first()).toBeVisible();
  expect(readFileSync('tests/artifacts/screens/payouts-ledger.png').length).toBeGreaterThan(10_000);
});
