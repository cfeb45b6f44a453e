import { expect, test, type Page } from '@playwright/test';
import { openDemoStudy, shot, signInAs, writeHeaders } from './helpers';

/** A new design of the demo study, made through its form (which opens it, filling the cache); returns its ids. */
async function newDesign(page: Page, name: string) {
  await openDemoStudy(page);
  const base = page.url();
  await page.goto(`${base}/designs`);
  await page.getByLabel('New design name').fill(name);
  await page.getByLabel('Prior set for the new design').selectOption({ label: 'Harbourlight pilot' });
  await page.getByRole('button', { name: 'Create design' }).click();
  await expect(page.getByTestId('design-title')).toHaveText(name, { timeout: 20_000 });
  return { studyId: base.split('/').pop(), id: Number(page.url().split('/').pop()) };
}

/**
 * Holds the design's own GET for `ms` while the page shows the cached copy, so a keystroke lands
 * before the background refetch does (as on a slow connection).
 */
async function slowDesignReads(page: Page, studyId: string | undefined, id: number, ms: number) {
  await page.route(new RegExp(`/api/studies/${studyId}/designs/${id}$`), async (route) => {
    if (route.request().method() === 'GET') await new Promise((resolve) => setTimeout(resolve, ms));
    await route.continue();
  });
}

for (const variant of ['changed by a teammate'] as const) {
  test(`a keystroke right after a cached design opens stays unsaved when the refetch lands (design ${variant})`, async ({ page }) => {
    test.setTimeout(120_000);
    await signInAs(page, 'editor');
    const design = await newDesign(page, `Cached draft ${variant} ${Date.now()}`);
    // the first visit filled the cache; leave through the app so the cache stays
    await expect(page.getByLabel('Design name')).toBeVisible();
    await page.getByRole('link', { name: '← All designs' }).click();
    await expect(page).toHaveURL(/\/designs$/);
    if (variant === 'changed by a teammate') {
      const current = (await (await page.request.get(`/api/studies/${design.studyId}/designs/${design.id}`)).json()).design;
      expect((await page.request.put(`/api/studies/${design.studyId}/designs/${design.id}`, { headers: writeHeaders(page), data: { spec: { ...current.spec, probePairs: 6 }, version: current.version } })).status()).toBe(200);
    }
    // past the cache's fresh time, so opening the design refetches it in the background
    await page.waitForTimeout(11_000);
    await slowDesignReads(page, design.studyId, design.id, 2_000);
    const refetched = page.waitForResponse((r) => r.request().method() === 'GET' && new RegExp(`/designs/${design.id}$`).test(r.url()));
    await page.getByRole('link', { name: /^Cached draft/ }).filter({ hasText: variant }).click();
    const amount = page.getByLabel('Large amount L');
    await amount.fill('321');
    await expect(page.getByText('Unsaved changes')).toBeVisible();
    await refetched;
    // the refetched design arrives under the edit: the edit stays, and so does its unsaved state
    await page.waitForTimeout(500);
    await expect(amount).toHaveValue('321');
    await expect(page.getByText('Unsaved changes')).toBeVisible();
    await expect(page.getByRole('button', { name: 'Save design' })).toBeEnabled();
    if (variant === 'changed by a teammate') await expect(page.getByLabel('Reversal probes')).toHaveValue('6');
    await page.getByRole('button', { name: 'Freeze this design…' }).click();
    await expect(page.getByTestId('freeze-confirm')).toContainText('Save your edits first');
    await page.screenshot(shot('design-unsaved-after-teammate-save'));
  });
}

/**
 * Types into the large-amount field at the first instant it can be typed in: in the same moment the
 * form fills the field with the saved value, before React has run the form's effects (as a person
 * typing while the cached page paints, whose key press lands between React's commit and its
 * effects). Armed by setting `window.typeEarly`.
 */
function typeAtFirstInstant() {
  const value = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, 'value')!;
  const w = window as unknown as { typeEarly?: boolean; typedEarly?: boolean };
  Object.defineProperty(HTMLInputElement.prototype, 'value', {
    configurable: true,
    enumerable: value.enumerable,
    get() {
      return value.get!.call(this);
    },
    set(next: string) {
      value.set!.call(this, next);
      if (w.typeEarly && !w.typedEarly && (this as HTMLInputElement).name === 'largeAmount') {
        w.typedEarly = true;
        value.set!.call(this, '321');
        (this as HTMLInputElement).dispatchEvent(new Event('input', { bubbles: true }));
      }
    },
  });
}

test('a keystroke in the first instant after a cached design opens, before the form has settled, counts as unsaved', async ({ page }) => {
  test.setTimeout(120_000);
  await page.addInitScript(typeAtFirstInstant);
  await signInAs(page, 'editor');
  const name = `First instant ${Date.now()}`;
  await newDesign(page, name);
  await expect(page.getByLabel('Design name')).toBeVisible();
  await page.getByRole('link', { name: '← All designs' }).click();
  await expect(page).toHaveURL(/\/designs$/);
  await page.evaluate(() => ((window as unknown as { typeEarly: boolean }).typeEarly = true));
  await page.getByRole('link', { name }).click();
  await expect.poll(() => page.evaluate(() => (window as unknown as { typedEarly?: boolean }).typedEarly)).toBe(true);
  const amount = page.getByLabel('Large amount L');
  await expect(amount).toHaveValue('321');
  await page.waitForLoadState('networkidle');
  await page.screenshot(shot('design-unsaved-first-instant'));
  await expect(page.getByText('Unsaved changes')).toBeVisible();
  await expect(page.getByRole('button', { name: 'Save design' })).toBeEnabled();
  await page.getByRole('button', { name: 'Freeze this design…' }).click();
  await expect(page.getByTestId('freeze-confirm')).toContainText('Save your edits first');
});
