import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { openDemoStudy, shot, signInAs } from './helpers';

test.describe('power simulation', () => {
  test('the demo editor starts a run, watches its progress bar move and downloads the figure', async ({ page }) => {
    test.setTimeout(240_000);
    await signInAs(page, 'editor');
    await openDemoStudy(page);
    await page.getByRole('navigation', { name: 'Study sections' }).getByRole('link', { name: 'Power' }).click();
    await expect(page.getByRole('heading', { name: 'New power simulation' })).toBeVisible();
    const label = `Browser run ${Date.now()}`;
    const form = page.getByRole('form', { name: 'New power run' });
    await form.getByLabel('Label (shown in legends)').fill(label);
    await form.getByLabel('Sample sizes').fill('50:300:50');
    await form.getByLabel('Replications').fill('3000');
    await page.screenshot(shot('power-new-run'));
    await form.getByRole('button', { name: 'Start simulation' }).click();

    await expect(page.getByTestId('run-title')).toHaveText(label, { timeout: 60_000 });
    const bar = page.getByRole('progressbar', { name: 'Simulation progress' });
    await expect(bar).toBeVisible({ timeout: 30_000 });
    await expect.poll(async () => Number(await bar.getAttribute('aria-valuenow')), { timeout: 60_000 }).toBeGreaterThan(0);
    const first = Number(await bar.getAttribute('aria-valuenow'));
    await page.screenshot(shot('power-progress'));
    // the same progress is read back from the database by a fresh page load
    await page.reload();
    await expect
      .poll(async () => ((await bar.isVisible()) ? Number(await bar.getAttribute('aria-valuenow')) : 100), { timeout: 60_000 })
      .toBeGreaterThan(first);

    await expect(page.getByTestId('run-status')).toHaveText('Finished', { timeout: 180_000 });
    await expect(page.getByTestId('power-chart').locator('svg')).toBeVisible();
    await expect(page.getByTestId('method-text')).toContainText('sign test at the participant level');
    await expect(page.getByTestId('n-for-80')).not.toBeEmpty();
    await page.screenshot(shot('power-results'));

    const [png] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download PNG (300 dpi)' }).click()]);
    expect(png.suggestedFilename()).toMatch(/^power-run-\d+\.png$/);
    const bytes = readFileSync((await png.path())!);
    expect(bytes.subarray(1, 4).toString()).toBe('PNG');
    expect(bytes.readUInt32BE(16)).toBe(1950); // 6.5 in at 300 dpi
    const [svg] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download SVG' }).click()]);
    expect(readFileSync((await svg.path())!, 'utf8')).toContain(label);
  });

  test('a viewer opens runs but cannot start one', async ({ page }) => {
    await signInAs(page, 'viewer');
    await openDemoStudy(page);
    await page.getByRole('navigation', { name: 'Study sections' }).getByRole('link', { name: 'Power' }).click();
    await expect(page.getByRole('heading', { name: 'Power runs' })).toBeVisible();
    await expect(page.getByRole('heading', { name: 'New power simulation' })).toHaveCount(0);
  });
});
