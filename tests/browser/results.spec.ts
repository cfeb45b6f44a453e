import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { openDemoStudy, shot, signInAs } from './helpers';

test.describe('results', () => {
  test('the demo study shows the observed-vs-expected chart, the zone diagnosis and the downloads', async ({ page }) => {
    test.setTimeout(120_000);
    await signInAs(page, 'viewer');
    await openDemoStudy(page);
    await page.getByRole('navigation', { name: 'Study sections' }).getByRole('link', { name: 'Results' }).click();
    await expect(page.getByTestId('analysis-view')).toBeVisible({ timeout: 30_000 });
    const patterns = page.getByTestId('patterns-chart').locator('svg');
    await expect(patterns).toBeVisible();
    // 3 roles × 4 patterns × 3 series of bars
    await expect(page.getByTestId('patterns-chart').locator('rect[fill="#0f172a"]')).toHaveCount(12 + 1);
    await expect(page.getByTestId('zones-chart').locator('circle').first()).toBeVisible();
    await expect(page.getByTestId('zone-findings')).toContainText('probes');
    await expect(page.getByTestId('results-paragraph')).toContainText('not a clinical assessment');
    await expect(page.getByText('Secondary: pooled exact McNemar (assumes independent pairs)')).toBeVisible();
    await page.screenshot(shot('results-demo'));
    await page.getByTestId('patterns-chart').screenshot({ path: 'tests/artifacts/screens/results-patterns-chart.png' });
    await page.getByTestId('zones-chart').screenshot({ path: 'tests/artifacts/screens/results-zones-chart.png' });

    const downloads = page.getByTestId('analysis-downloads');
    const [csv] = await Promise.all([page.waitForEvent('download'), downloads.getByRole('link', { name: 'CSV' }).click()]);
    expect(readFileSync((await csv.path())!, 'utf8')).toContain('not a clinical assessment');
    const [png] = await Promise.all([page.waitForEvent('download'), downloads.getByRole('link', { name: 'Zone chart (PNG)' }).click()]);
    const bytes = readFileSync((await png.path())!);
    expect(bytes.subarray(1, 4).toString()).toBe('PNG');
    expect(bytes.readUInt32BE(16)).toBe(1950); // 6.5 in at 300 dpi
    const [svg] = await Promise.all([page.waitForEvent('download'), downloads.getByRole('link', { name: 'Pattern chart (SVG)' }).click()]);
    expect(readFileSync((await svg.path())!, 'utf8')).toContain('Choice patterns by pair role');
    // a viewer sees results but neither the upload nor the new-analysis form
    await expect(page.getByLabel('Upload observed choices (CSV)')).toHaveCount(0);
  });

  test('an editor states exclusions with their counts and saves a new version of the analysis', async ({ page }) => {
    test.setTimeout(120_000);
    await signInAs(page, 'editor');
    await openDemoStudy(page);
    await page.getByRole('navigation', { name: 'Study sections' }).getByRole('link', { name: 'Results' }).click();
    await expect(page.getByTestId('observed-summary')).toContainText('participants served with this version', { timeout: 30_000 });
    await expect(page.getByText(/Failed attention check\s*— applies to 2, removes 2/)).toBeVisible();
    await page.getByRole('button', { name: 'Run and save the analysis' }).click();
    await expect(page.getByRole('heading', { name: 'Main analysis, version 2' })).toBeVisible({ timeout: 60_000 });
    await expect(page.getByLabel('Analysis', { exact: true })).toContainText('Main analysis, version 2');
    await expect(page.getByTestId('patterns-chart').locator('svg')).toBeVisible();
    await page.screenshot(shot('results-new-version'));
  });
});
