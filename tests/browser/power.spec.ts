import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { openDemoStudy, shot, signInAs } from './helpers';

test.describe('power simulation', () => {
  test('the demo editor starts a run with stress truths, watches its progress bar move, sees power under each truth and downloads the figure', async ({ page }) => {
    test.setTimeout(240_000);
    await signInAs(page, 'editor');
    await openDemoStudy(page);
    await page.getByRole('navigation', { name: 'Study sections' }).getByRole('link', { name: 'Power' }).click();
    await expect(page.getByRole('heading', { name: 'New power simulation' })).toBeVisible();
    const label = `Browser run ${Date.now()}`;
    const form = page.getByRole('form', { name: 'New power run' });
    await form.getByLabel('Label (shown in legends)').fill(label);
    await form.getByLabel('Sample sizes').fill('50:300:50');
    await form.getByLabel('Replications').fill('1500');
    // the delay-sensitivity stress is ticked by default; add noisier choices
    await expect(form.getByLabel('Delay sensitivity below 1, drawn per participant')).toBeChecked();
    await form.getByLabel('Noisier choices (γ times a factor)').check();
    await expect(form.getByLabel('γ factor')).toHaveValue('0.5');
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
    const truths = page.getByTestId('stress-table').locator('tr');
    await expect(truths).toHaveCount(3);
    await expect(truths.nth(1)).toContainText('delay sensitivity s drawn per participant from U(0.4, 0.9)');
    await expect(truths.nth(2)).toContainText('noisier choices (γ × 0.5)');
    await expect(page.getByTestId('method-text')).toContainText('2 stress truth(s)');
    await expect(page.getByTestId('power-chart')).toContainText('Stress: s ~ U(0.4, 0.9)');
    await page.getByTestId('power-chart').scrollIntoViewIfNeeded();
    await page.screenshot(shot('power-results'));
    await page.getByTestId('stress-table').scrollIntoViewIfNeeded();
    await page.screenshot(shot('power-stress-table'));

    const [png] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download PNG (300 dpi)' }).click()]);
    expect(png.suggestedFilename()).toMatch(/^power-run-\d+\.png$/);
    const bytes = readFileSync((await png.path())!);
    expect(bytes.subarray(1, 4).toString()).toBe('PNG');
    expect(bytes.readUInt32BE(16)).toBe(1950); // 6.5 in at 300 dpi
    const [svg] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download SVG' }).click()]);
    const svgText = readFileSync((await svg.path())!, 'utf8');
    expect(svgText).toContain(label);
    expect(svgText).toContain('Stress: noisier choices (γ × 0.5)');
  });

  test('a viewer opens runs but cannot start one', async ({ page }) => {
    await signInAs(page, 'viewer');
    await openDemoStudy(page);
    await page.getByRole('navigation', { name: 'Study sections' }).getByRole('link', { name: 'Power' }).click();
    await expect(page.getByRole('heading', { name: 'Power runs' })).toBeVisible();
    await expect(page.getByRole('heading', { name: 'New power simulation' })).toHaveCount(0);
  });
});
