import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { openDemoStudy, shot, signInAs } from './helpers';

/** Pixels the page can be scrolled sideways (0 when nothing sticks out), with the elements sticking out for the failure message. */
async function sideways(page: Page): Promise<string | 0> {
  return page.evaluate(() => {
    const over = document.documentElement.scrollWidth - document.documentElement.clientWidth;
    if (over <= 0) return 0;
    const width = document.documentElement.clientWidth;
    const culprits = [...document.querySelectorAll('body *')]
      .filter((el) => el.getBoundingClientRect().right > width + 1 && !el.closest('.overflow-x-auto'))
      .slice(-3)
      .map((el) => `${el.tagName.toLowerCase()}.${String(el.getAttribute('class') ?? '').split(' ').slice(0, 3).join('.')}`);
    return `${over}px (${culprits.join(', ')})`;
  });
}

test('the glossary explains each term with its formula and source, and a help button opens a term’s explanation by tap or keyboard', async ({ page }) => {
  await signInAs(page, 'viewer');
  await page.getByTestId('glossary-link').click();
  await expect(page.getByRole('heading', { name: 'Methods and glossary' })).toBeVisible();
  const gap = page.locator('#gap-product');
  await expect(gap).toContainText('C(D) = A(D) · B(D)');
  await expect(gap).toContainText('Source');
  for (const id of ['maximin-gap', 'patterns', 'far-near-view', 'standing-day', 'reversal-zone']) await expect(page.locator(`#${id}`)).toBeVisible();
  await expect(page.locator('#reversal-zone')).toContainText('D_lower = d + (1 − x)/(xK)');
  expect(await page.getByTestId('glossary-entry').count()).toBeGreaterThan(20);
  await page.screenshot(shot('glossary'));

  // on a design page, the help button beside "Reversal zone" opens its explanation (click, not hover) and links to the entry
  await openDemoStudy(page);
  await page.getByRole('link', { name: 'Designs' }).click();
  await page.getByRole('link', { name: 'Personalised, two-week soon delay' }).click();
  const help = page.getByTestId('help-reversal-zone').first();
  await expect(help).toHaveAttribute('aria-expanded', 'false');
  await help.click();
  await expect(help).toHaveAttribute('aria-expanded', 'true');
  const panel = page.getByTestId('help-panel-reversal-zone');
  await expect(panel).toContainText('late delays D');
  await page.screenshot({ path: 'tests/artifacts/screens/glossary-help-open.png' });
  await page.keyboard.press('Escape');
  await expect(panel).toHaveCount(0);
  // keyboard: focus and Enter opens it too
  await help.focus();
  await page.keyboard.press('Enter');
  await expect(panel).toBeVisible();
  await panel.getByRole('link', { name: 'Formula and source' }).click();
  await expect(page).toHaveURL(/\/glossary#reversal-zone$/);

  // viewers see the design's fields greyed out: disabled, with the disabled background
  await page.goBack();
  const field = page.getByLabel('Design name');
  await expect(field).toBeDisabled();
  const background = await field.evaluate((el) => getComputedStyle(el).backgroundColor);
  const enabledLook = await page.evaluate(() => {
    const probe = document.createElement('input');
    probe.className = (document.querySelector('input[aria-invalid]') as HTMLInputElement).className;
    document.body.append(probe);
    const colour = getComputedStyle(probe).backgroundColor;
    probe.remove();
    return colour;
  });
  expect(background).not.toBe(enabledLook);
});

test('at phone width nothing scrolls sideways and Sign out is fully on screen', async ({ page }) => {
  await page.setViewportSize({ width: 375, height: 740 });
  await signInAs(page, 'owner');
  await openDemoStudy(page);
  const base = page.url().replace(/\/$/, '');
  const paths = ['', '/priors', '/designs', '/compare', '/power', '/item-bank', '/api', '/participants', '/team', '/audit'];
  const wide: string[] = [];
  for (const path of paths) {
    await page.goto(`${base}${path}`);
    await expect(page.getByTestId('study-title')).toBeVisible();
    await page.waitForLoadState('networkidle');
    const over = await sideways(page);
    if (over) wide.push(`${path || '/'}: ${over}`);
  }
  for (const path of ['/studies', '/account', '/glossary']) {
    await page.goto(path);
    await page.waitForLoadState('networkidle');
    const over = await sideways(page);
    if (over) wide.push(`${path}: ${over}`);
  }
  expect(wide).toEqual([]);
  const signOut = page.getByRole('button', { name: 'Sign out' });
  const box = await signOut.boundingBox();
  expect(box).not.toBeNull();
  expect(box!.x).toBeGreaterThanOrEqual(0);
  expect(box!.x + box!.width).toBeLessThanOrEqual(375);
  await page.goto(`${base}/designs`);
  await expect(page.getByTestId('design-row').first()).toBeVisible();
  await page.screenshot(shot('phone-designs'));
  await page.goto(`${base}/participants?q=HL-R&pageSize=10`);
  await expect(page.getByTestId('participant-row').first()).toBeVisible();
  await page.screenshot(shot('phone-participants'));
  await page.goto(base);
  await expect(page.getByTestId('study-title')).toBeVisible();
  await page.waitForLoadState('networkidle');
  await page.screenshot({ path: 'tests/artifacts/screens/phone-overview.png' });
});

test('charts use one font at legible sizes, and their labels do not sit on each other', async ({ page }) => {
  await signInAs(page, 'viewer');
  await openDemoStudy(page);
  await page.getByRole('link', { name: 'Designs' }).click();
  await page.getByRole('link', { name: 'Personalised, two-week soon delay' }).click();
  for (const id of ['gap-chart', 'value-chart']) {
    const chart = page.getByTestId(id);
    await expect(chart.locator('path[data-series]').first()).toBeVisible();
    const report = await chart.evaluate((root) => {
      const svg = root.tagName.toLowerCase() === 'svg' ? root : root.querySelector('svg')!;
      const texts = [...svg.querySelectorAll('text')];
      const fonts = new Set(texts.map((t) => getComputedStyle(t).fontFamily));
      const sizes = texts.map((t) => Number(getComputedStyle(t).fontSize.replace('px', ''))); // in viewBox units: SVG text sizes are not scaled in computed style
      const labels = [...svg.querySelectorAll('text[data-label]')].map((t) => (t as SVGTextElement).getBBox());
      let overlaps = 0;
      for (let i = 0; i < labels.length; i++)
        for (let j = i + 1; j < labels.length; j++) {
          const a = labels[i];
          const b = labels[j];
          if (a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height) overlaps++;
        }
      return { fonts: [...fonts], smallest: Math.min(...sizes), labels: labels.length, overlaps, bodyFont: getComputedStyle(document.body).fontFamily };
    });
    expect(report.fonts).toEqual([report.bodyFont]); // ticks no longer fall back to d3's "sans-serif"
    expect(report.smallest).toBeGreaterThanOrEqual(12);
    expect(report.overlaps).toBe(0);
  }
  await page.getByTestId('gap-chart').scrollIntoViewIfNeeded();
  await page.screenshot({ path: 'tests/artifacts/screens/chart-style-gap.png' });
});

test('the power figure’s caption wraps inside the figure on the page, in the PNG and in the SVG, which renders in its embedded font', async ({ page }) => {
  await signInAs(page, 'viewer');
  await openDemoStudy(page);
  await page.getByRole('navigation', { name: 'Study sections' }).getByRole('link', { name: 'Power' }).click();
  await page.getByRole('link', { name: /\(demo\)/ }).first().click(); // the seeded run
  const chart = page.getByTestId('power-chart').locator('svg');
  await expect(chart).toBeVisible();
  /** Lines of caption text that reach past the figure's right edge, measured by the browser's own text layout. */
  const overflowing = (root: Element) => {
    const svg = root as SVGSVGElement;
    const right = svg.viewBox.baseVal.width;
    return [...svg.querySelectorAll('text[data-line]')].filter((t) => (t as SVGTextElement).getBBox().x + (t as SVGTextElement).getBBox().width > right).map((t) => t.textContent);
  };
  expect(await chart.evaluate(overflowing)).toEqual([]);
  await expect(chart.locator('text[data-line="caution"]').first()).toContainText('Simulated hypothetical choices');
  await page.getByTestId('power-chart').scrollIntoViewIfNeeded();
  await page.screenshot({ path: 'tests/artifacts/screens/power-figure-page.png' });

  // the SVG download, opened on its own page: wraps the same way and draws in its embedded font
  const [svgFile] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download SVG' }).click()]);
  const svgText = readFileSync((await svgFile.path())!, 'utf8');
  expect(svgText).toContain('@font-face');
  const [pngFile] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download PNG (300 dpi)' }).click()]);
  const png = readFileSync((await pngFile.path())!);
  const own = await page.context().newPage();
  await own.setContent(`<!doctype html><html><body style="margin:0;font-family:serif">${svgText}</body></html>`);
  const alone = own.locator('svg').first();
  await own.evaluate(() => document.fonts.ready);
  expect(await alone.evaluate(overflowing)).toEqual([]);
  // the embedded face is the one in use: the document has loaded it, though the page around it asks for a serif
  expect(await own.evaluate(() => [...document.fonts].filter((f) => f.family.replace(/['"]/g, '') === 'Source Sans 3' && f.status === 'loaded').length)).toBeGreaterThan(0);
  await own.screenshot({ path: 'tests/artifacts/screens/power-figure-svg.png', fullPage: true });
  await own.setContent(`<!doctype html><html><body style="margin:0"><img src="data:image/png;base64,${png.toString('base64')}" style="width:975px"></body></html>`);
  await own.screenshot({ path: 'tests/artifacts/screens/power-figure-png.png', fullPage: true });
  await own.close();
});

test('a key shown once has a copy button that puts exactly the key on the clipboard, and selects it where the browser refuses', async ({ page }) => {
  await signInAs(page, 'operator');
  await openDemoStudy(page);
  await page.context().grantPermissions(['clipboard-read', 'clipboard-write'], { origin: new URL(page.url()).origin });
  await page.getByRole('link', { name: 'API', exact: true }).click();
  await page.getByLabel('Key name').fill(`Copy check ${Date.now()}`);
  await page.getByRole('button', { name: 'Create key' }).click();
  const secret = (await page.getByTestId('new-secret').textContent())!.trim();
  expect(secret).toMatch(/^sbk_/);
  await page.getByTestId('copy-secret').click();
  await expect(page.getByTestId('copy-secret')).toHaveText('Copied');
  expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(secret);
  await page.getByTestId('new-secret').scrollIntoViewIfNeeded();
  await page.screenshot(shot('api-key-copied'));

  // a browser that refuses the clipboard: the key is selected for Ctrl+C, and the page says so
  await page.evaluate(() => {
    navigator.clipboard.writeText = () => Promise.reject(new DOMException('denied', 'NotAllowedError'));
  });
  await page.getByLabel('Key name').fill(`Copy refused ${Date.now()}`);
  await page.getByRole('button', { name: 'Create key' }).click();
  await expect(page.getByTestId('new-secret')).not.toHaveText(secret);
  await page.getByTestId('copy-secret').click();
  await expect(page.getByRole('alert').filter({ hasText: 'did not let the page copy' })).toBeVisible();
  expect(await page.evaluate(() => window.getSelection()?.toString().trim())).toBe((await page.getByTestId('new-secret').textContent())!.trim());
  await page.screenshot(shot('api-key-copy-refused'));
});
