import { readFileSync } from 'node:fs';
import Papa from 'papaparse';
import { expect, test } from '@playwright/test';
import { openDemoStudy, shot, signInAs } from './helpers';

test('the demo operator creates an API key, downloads the item bank and sees a participant served through the API', async ({ page }) => {
  await signInAs(page, 'operator');
  await openDemoStudy(page);
  const studyUrl = page.url();

  // A key for the personalised frozen version; the secret is shown once.
  await page.getByRole('link', { name: 'API', exact: true }).click();
  await expect(page.getByTestId('curl-example')).toContainText('/probe-items');
  const keyName = `Session software ${Date.now()}`;
  await page.getByLabel('Key name').fill(keyName);
  const versionOption = page.getByLabel('Serves frozen version').locator('option', { hasText: 'personalised' }).first();
  await page.getByLabel('Serves frozen version').selectOption(await versionOption.getAttribute('value'));
  await page.getByRole('button', { name: 'Create key' }).click();
  const secret = (await page.getByTestId('new-secret').textContent())!.trim();
  expect(secret).toMatch(/^sbk_/);
  await expect(page.getByTestId('api-key-row').filter({ hasText: keyName })).toBeVisible();
  await page.screenshot(shot('item-bank-api-key'));

  // The item bank of that version as CSV, with the hash and seed in its name and header.
  await page.getByRole('link', { name: 'Item bank' }).click();
  await page.getByTestId('version-select').selectOption(await page.getByTestId('version-select').locator('option', { hasText: 'personalised' }).first().getAttribute('value'));
  await expect(page.getByTestId('rounding-report')).toBeVisible({ timeout: 20_000 });
  await page.screenshot(shot('item-bank-preview'));
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('download-csv').click()]);
  expect(download.suggestedFilename()).toMatch(/^switchback-items-\d+-.+-[0-9a-f]{12}-seed\d+\.csv$/);
  const csv = readFileSync((await download.path())!, 'utf8');
  expect(csv).toMatch(/^# Switchback item bank/);
  const rows = Papa.parse<Record<string, string>>(csv, { header: true, comments: '#', skipEmptyLines: true }).data;
  const calibration = rows.filter((r) => r.role === 'calibration');
  expect(calibration.length).toBeGreaterThan(4);

  // The lab's software asks for a participant's probe block with the key.
  const participantId = `BR-${Date.now()}`;
  const responses = Object.fromEntries(
    calibration.map((r) => {
      const k = r.magnitude === 'small' ? 0.05 : 0.01;
      return [r.id, Number(r.laterAmount) / (1 + k * Number(r.laterDelay)) > Number(r.soonerAmount) ? 'later' : 'sooner'];
    }),
  );
  const studyId = new URL(studyUrl).pathname.split('/')[2];
  const reply = await page.request.post(`/api/v1/studies/${studyId}/probe-items`, { headers: { Authorization: `Bearer ${secret}` }, data: { participantId, responses } });
  expect(reply.status()).toBe(200);
  const body = await reply.json();
  expect(body.items.length).toBeGreaterThan(2);

  // The participant appears in the study.
  await page.getByRole('link', { name: 'Participants' }).click();
  await expect(page.getByTestId('participant-row').filter({ hasText: participantId })).toBeVisible({ timeout: 20_000 });
  await page.getByRole('button', { name: participantId }).click();
  await expect(page.getByRole('table', { name: `Items served to ${participantId}` }).getByTestId('item-row').first()).toBeVisible();
  await page.screenshot(shot('item-bank-participants'));
});
