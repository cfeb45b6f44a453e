import { expect, test } from '@playwright/test';
import Papa from 'papaparse';
import { readFileSync } from 'node:fs';
import { openDemoStudy, shot, signInAs } from './helpers';

// The demo study holds HL-0001…HL-0003 and HL-R001…HL-R036 (seeders 03 and 06), plus whoever other tests serve.
test('the participants list searches, filters by status and version, pages, keeps its state in the address and exports what is filtered', async ({ page }) => {
  test.setTimeout(120_000);
  await signInAs(page, 'operator');
  await openDemoStudy(page);
  const base = page.url();
  const rows = page.getByTestId('participant-row');
  const range = page.getByTestId('participant-range');

  // a linkable page: search and page size from the address
  await page.goto(`${base}/participants?q=hl-r&pageSize=10`);
  await expect(range).toHaveText('1–10 of 36 · page 1 of 4');
  await expect(rows).toHaveCount(10);
  await page.getByRole('button', { name: 'Next' }).click();
  await expect(page).toHaveURL(/[?&]page=2(&|$)/);
  await expect(range).toHaveText('11–20 of 36 · page 2 of 4');
  await page.reload();
  await expect(range).toHaveText('11–20 of 36 · page 2 of 4');
  await expect(page.getByTestId('participant-search')).toHaveValue('hl-r');
  await page.screenshot(shot('participants-search-page-2'));

  // a status filter: its count is the list's total, every row has that status, and the page goes back to 1
  const counts = await Promise.all(['started', 'calibrated', 'served', 'completed', 'abandoned'].map(async (s) => [s, Number((await page.getByTestId(`session-count-${s}`).innerText()).replace(/\D+/g, ''))] as const));
  expect(counts.reduce((a, [, n]) => a + n, 0)).toBe(36);
  const [status, count] = counts.find(([, n]) => n > 0)!;
  await page.getByTestId(`session-count-${status}`).click();
  await expect(page).toHaveURL(new RegExp(`status=${status}`));
  await expect(page).not.toHaveURL(/page=2/);
  await expect(range).toContainText(`of ${count}`);
  for (const cell of await rows.locator('td:nth-child(2)').allInnerTexts()) expect(cell).toBe(status);

  // the frozen version filter narrows to one version (all demo participants share the personalised one)
  const version = page.getByTestId('participant-version');
  const options = await version.locator('option').allInnerTexts();
  expect(options[0]).toBe('all versions');
  await version.selectOption({ index: 1 });
  await expect(page).toHaveURL(/version=\d+/);

  // typing searches once typing pauses, back at page 1
  await page.goto(`${base}/participants`);
  await page.getByTestId('participant-search').fill('HL-000');
  await expect(page).toHaveURL(/q=HL-000/);
  await expect(rows).toHaveCount(3);
  await expect(range).toHaveText('1–3 of 3 · page 1 of 1');
  await page.screenshot(shot('participants-search'));

  // the export covers exactly what is filtered, as a plain CSV whose last column is the caution
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-participants').click()]);
  const csv = Papa.parse<Record<string, string>>(readFileSync((await download.path())!, 'utf8'), { header: true, skipEmptyLines: true });
  expect(csv.errors).toEqual([]);
  expect(csv.meta.fields?.at(-1)).toBe('caution');
  expect(new Set(csv.data.map((r) => r.participantId))).toEqual(new Set(['HL-0001', 'HL-0002', 'HL-0003']));
  expect(csv.data.every((r) => r.caution.includes('not a clinical assessment'))).toBe(true);

  // a link with parameters the list cannot read opens with defaults and says what it ignored
  await page.goto(`${base}/participants?page=abc&pageSize=7&status=lost`);
  await expect(page.getByText('Part of this link was not understood')).toBeVisible();
  await expect(page.getByText('Ignored status, page, pageSize')).toBeVisible();
  await expect(rows.first()).toBeVisible();
  await page.screenshot(shot('participants-bad-link'));
});
