import { readFileSync } from 'node:fs';
import Papa from 'papaparse';
import { expect, test } from '@playwright/test';
import { openDemoStudy, shot, signInAs, writeHeaders } from './helpers';

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
  // the keys table names the design and its version number, not a database id
  await expect(page.getByTestId('api-key-row').filter({ hasText: keyName }).getByTestId('api-key-version')).toHaveText(/^.+, version \d+$/);
  await page.screenshot(shot('item-bank-api-key'));

  // The item bank of that version as CSV, with the hash and seed in its name and header.
  await page.getByRole('link', { name: 'Item bank' }).click();
  await page.getByTestId('version-select').selectOption(await page.getByTestId('version-select').locator('option', { hasText: 'personalised' }).first().getAttribute('value'));
  await expect(page.getByTestId('rounding-report')).toBeVisible({ timeout: 20_000 });
  await page.screenshot(shot('item-bank-preview'));
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('download-csv').click()]);
  expect(download.suggestedFilename()).toMatch(/^switchback-items-\d+-.+-[0-9a-f]{12}-seed\d+\.csv$/);
  const csv = readFileSync((await download.path())!, 'utf8');
  expect(csv).toMatch(/^id,block,role,/); // plain CSV: the header row first, no comment lines
  const rows = Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true }).data;
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
  // answered by the production server's direct path (scripts/serve.mjs), not through Next
  expect(reply.headers()['x-switchback-path']).toBe('direct');
  const body = await reply.json();
  expect(body.items.length).toBeGreaterThan(2);

  // The participant appears in the study.
  await page.getByRole('link', { name: 'Participants' }).click();
  await expect(page.getByTestId('participant-row').filter({ hasText: participantId })).toBeVisible({ timeout: 20_000 });
  await page.getByRole('button', { name: participantId }).click();
  await expect(page.getByRole('table', { name: `Items served to ${participantId}` }).getByTestId('item-row').first()).toBeVisible();
  await page.screenshot(shot('item-bank-participants'));

  // Revoked through the app (Next's module copy), the key is refused at once by the direct path
  // (its own module copy, same process): 401 even for a body it would otherwise answer 422.
  const { keys } = (await (await page.request.get(`/api/studies/${studyId}/api-keys`)).json()) as { keys: Array<{ id: number; name: string }> };
  const keyId = keys.find((k) => k.name === keyName)!.id;
  const replay = await page.request.post(`/api/v1/studies/${studyId}/probe-items`, { headers: { Authorization: `Bearer ${secret}` }, data: { participantId, responses } });
  expect(await replay.json()).toEqual(body); // the same items again, and the key freshly cached by the direct path
  expect((await page.request.delete(`/api/studies/${studyId}/api-keys/${keyId}`, { headers: writeHeaders(page) })).status()).toBe(200);
  const invalid = await page.request.post(`/api/v1/studies/${studyId}/probe-items`, { headers: { Authorization: `Bearer ${secret}` }, data: { participantId: `${participantId}-b`, responses: { nothing: 'maybe' } } });
  expect([invalid.status(), invalid.headers()['x-switchback-path']]).toEqual([401, 'direct']);
  const valid = await page.request.post(`/api/v1/studies/${studyId}/probe-items`, { headers: { Authorization: `Bearer ${secret}` }, data: { participantId: `${participantId}-c`, responses } });
  expect(valid.status()).toBe(401);
});

test('the demo operator fills in the answer sheet offline, serves the batch and downloads the item sets as CSV', async ({ page }) => {
  await signInAs(page, 'operator');
  await openDemoStudy(page);
  const studyId = new URL(page.url()).pathname.split('/')[2];
  await page.getByRole('link', { name: 'Participants' }).click();
  const select = page.getByTestId('version-select');
  const versionId = (await select.locator('option', { hasText: 'personalised' }).first().getAttribute('value'))!;
  await select.selectOption(versionId);

  // The empty sheet names exactly the version's calibration items, in the bank's order.
  const [sheet] = await Promise.all([page.waitForEvent('download'), page.getByTestId('answer-sheet').click()]);
  expect(sheet.suggestedFilename()).toMatch(/^switchback-answer-sheet-\d+-[0-9a-f]{12}\.csv$/);
  const columns = Papa.parse<string[]>(readFileSync((await sheet.path())!, 'utf8'), { skipEmptyLines: true }).data[0];
  const bank = await (await page.request.get(`/api/studies/${studyId}/item-bank/${versionId}`)).json();
  type Item = { id: string; block: string; magnitude?: string | null; soonerAmount: number; soonerDelay: number; laterAmount: number; laterDelay: number };
  const calibration = (bank.items as Item[]).filter((i) => i.block === 'calibration');
  expect(columns).toEqual(['participantId', ...calibration.map((i) => i.id)]);

  // Two participants answer as noise-free hyperbolic choosers (k per day), the way a lab would fill the sheet.
  const stamp = Date.now();
  const answer = (k: number) => (i: Item) => (i.laterAmount / (1 + k * i.laterDelay) > i.soonerAmount / (1 + k * i.soonerDelay) ? 'later' : 'sooner');
  const rows = [
    [`OFF-${stamp}-a`, ...calibration.map(answer(0.04))],
    [`OFF-${stamp}-b`, ...calibration.map(answer(0.01))],
  ];
  await page.getByTestId('batch-file').setInputFiles({ name: 'answers.csv', mimeType: 'text/csv', buffer: Buffer.from(Papa.unparse([columns, ...rows])) });
  await page.getByRole('button', { name: 'Serve participants' }).click();
  await expect(page.getByText('2 of 2 participants served')).toBeVisible({ timeout: 20_000 });

  const [items] = await Promise.all([page.waitForEvent('download'), page.getByTestId('batch-csv').click()]);
  const served = Papa.parse<Record<string, string>>(readFileSync((await items.path())!, 'utf8'), { header: true, skipEmptyLines: true }).data;
  expect(new Set(served.map((r) => r.participantId))).toEqual(new Set([`OFF-${stamp}-a`, `OFF-${stamp}-b`]));
  expect(served.every((r) => r.status === 'served' && r.id !== '')).toBe(true);
  await expect(page.getByTestId('participant-row').filter({ hasText: `OFF-${stamp}-a` })).toBeVisible({ timeout: 20_000 });
  await page.screenshot(shot('item-bank-batch'));
});
