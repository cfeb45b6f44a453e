import { expect, test } from '@playwright/test';
import { openDemoStudy, shot, signInAs } from './helpers';

test('the design page previews power while the design is edited, and turns the preview into a saved run', async ({ page }) => {
  test.setTimeout(180_000);
  await signInAs(page, 'editor');
  await openDemoStudy(page);
  const base = page.url().match(/\/studies\/\d+/)![0];
  const name = `Preview check ${Date.now()}`;
  await page.goto(`${base}/designs`);
  await page.getByLabel('New design name').fill(name);
  const priorChoice = page.getByLabel('Prior set for the new design');
  await expect(priorChoice.locator('option')).not.toHaveCount(0);
  await priorChoice.selectOption({ index: 0 });
  await page.getByRole('button', { name: 'Create design' }).click();
  await expect(page.getByTestId('design-title')).toHaveText(name, { timeout: 20_000 });

  // the preview is labelled as one and computes a curve with its band without any click
  const preview = page.getByTestId('power-preview');
  await expect(preview.getByTestId('preview-label')).toHaveText('Preview');
  await expect(preview.getByTestId('preview-status')).toContainText('up to date', { timeout: 30_000 });
  const chart = preview.getByTestId('power-chart');
  await expect(chart.locator('svg')).toBeVisible();
  await expect(chart).toContainText('not a saved run');
  const before = await chart.innerHTML();

  // a field change recomputes it: typing goes on while it runs, and only the settled value is shown
  const ratio = page.getByLabel('Magnitude ratio S/L');
  await ratio.fill('0.5');
  await expect(preview.getByTestId('preview-status')).not.toContainText('up to date');
  await ratio.fill('0.55');
  await expect(ratio).toHaveValue('0.55');
  await expect(preview.getByTestId('preview-status')).toContainText('up to date', { timeout: 30_000 });
  await expect.poll(() => chart.innerHTML()).not.toBe(before);
  await preview.scrollIntoViewIfNeeded();
  await page.screenshot(shot('power-preview'));

  // a saved run needs a frozen version: save, freeze, then start it from the preview
  const start = preview.getByRole('button', { name: /Start a saved run \(2,000 replications\)/ });
  await expect(start).toBeDisabled();
  await expect(preview).toContainText('save and freeze the design first');
  await page.getByRole('button', { name: 'Save design' }).click();
  await expect(page.getByText('Saved.')).toBeVisible();
  await page.getByRole('button', { name: 'Freeze this design…' }).click();
  await page.getByRole('button', { name: 'Freeze version 1' }).click();
  await expect(page.getByTestId('freeze-status')).toContainText('frozen as version 1');
  await expect(start).toBeEnabled();
  await start.click();
  await expect(page).toHaveURL(/\/power\/\d+$/, { timeout: 20_000 });
  await expect(page.getByText(`${name}: from the preview`).first()).toBeVisible();
  await expect(page.getByText('2000 replications', { exact: false }).or(page.getByText('2,000', { exact: false })).first()).toBeVisible({ timeout: 30_000 });
  await page.screenshot(shot('power-preview-saved-run'));
});
