import { expect, test, type Page } from '@playwright/test';
import { openDemoStudy, shot, signInAs, writeHeaders } from './helpers';

async function studyUrl(page: Page) {
  await openDemoStudy(page);
  const match = page.url().match(/\/studies\/(\d+)/);
  if (!match) throw new Error(`no study id in ${page.url()}`);
  return `/studies/${match[1]}`;
}

async function createDesign(page: Page, base: string, name: string, prior: string) {
  await page.goto(`${base}/designs`);
  await page.getByLabel('New design name').fill(name);
  await page.getByLabel('Prior set for the new design').selectOption({ label: prior });
  await page.getByRole('button', { name: 'Create design' }).click();
  await expect(page.getByTestId('design-title')).toHaveText(name, { timeout: 20_000 });
}

test('the demo editor creates a prior and two designs, compares them and freezes one', async ({ page }) => {
  test.setTimeout(180_000);
  await signInAs(page, 'editor');
  const base = await studyUrl(page);
  const stamp = Date.now();
  const priorName = `Canteen pilot ${stamp}`;

  // a prior set, with the live chart and an inline error first
  await page.goto(`${base}/priors`);
  await page.getByRole('button', { name: 'New prior set' }).click();
  await page.getByLabel('Prior set name').fill(priorName);
  await page.getByLabel('Correlation of ln k and ln K').fill('1.5');
  await page.getByRole('button', { name: 'Create prior set' }).click();
  await expect(page.getByText('Correlation must be between −0.99 and 0.99.')).toBeVisible();
  await page.getByLabel('Correlation of ln k and ln K').fill('0.5');
  await page.getByLabel('Median rate, small reward (per day)').fill('0.03');
  await expect(page.getByTestId('reversible-share')).toContainText('%');
  await expect(page.getByTestId('prior-scatter').locator('path[data-series]')).toHaveCount(1);
  await page.getByRole('button', { name: 'Create prior set' }).click();
  await expect(page.getByTestId('prior-item').filter({ hasText: priorName })).toBeVisible();
  await expect(page.getByRole('heading', { name: priorName })).toBeVisible();
  await page.screenshot(shot('planner-prior'));

  // a bad pilot file names the line and the column
  await page.getByLabel('Fit from pilot data (CSV)').setInputFiles({ name: 'pilot.csv', mimeType: 'text/csv', buffer: Buffer.from('participant,kSmall,kLarge\np1,0.02,0.01\np2,abc,0.01\np3,0.03,0.02\n') });
  await expect(page.getByTestId('pilot-issues')).toContainText('line 3: kSmall');

  // a good pilot file fills the form with the fitted prior, saved as a new prior set
  await page.getByRole('button', { name: 'New prior set' }).click();
  await page.getByLabel('Prior set name').fill(`Pilot fit ${stamp}`);
  await page.getByLabel('Fit from pilot data (CSV)').setInputFiles({ name: 'pilot-good.csv', mimeType: 'text/csv', buffer: Buffer.from('participant,kSmall,kLarge\np1,0.01,0.01\np2,0.04,0.01\np3,0.02,0.02\n') });
  await expect(page.getByText('Fitted from 3 participants in “pilot-good.csv”')).toBeVisible();
  // geometric mean of 0.01, 0.04, 0.02 is 0.02 (by hand)
  await expect(page.getByLabel('Median rate, small reward (per day)')).toHaveValue(/^0\.0(2|19999)/);
  await page.getByRole('button', { name: 'Create prior set' }).click();
  await expect(page.locator('li').filter({ hasText: `Pilot fit ${stamp}` })).toContainText('from pilot data');

  // two designs on that prior
  const first = `Fortnight personalised ${stamp}`;
  const second = `Population check ${stamp}`;
  await createDesign(page, base, first, priorName);
  await expect(page.getByTestId('stat-zone')).not.toHaveText('none');
  const before = await page.getByTestId('stat-soon-delay').textContent();
  await page.getByLabel('Soon delay d (days)').fill('30');
  await expect(page.getByTestId('stat-soon-delay')).toHaveText('30');
  expect(before).toBe('14');
  await expect(page.getByTestId('gap-chart')).toBeVisible();
  await expect(page.getByTestId('value-chart')).toBeVisible();
  await page.getByLabel('Magnitude ratio S/L').fill('1.2');
  await expect(page.getByText('The magnitude ratio S/L must be below 1.')).toBeVisible();
  await page.getByLabel('Magnitude ratio S/L').fill('0.5');
  await page.getByRole('button', { name: 'Save design' }).click();
  await expect(page.getByText('Saved.')).toBeVisible();
  await page.screenshot(shot('planner-design'));

  await createDesign(page, base, second, priorName);
  await page.getByLabel('Design type').selectOption('population');
  await page.getByLabel('Criterion').selectOption('expected-reversal-rate');
  await page.getByRole('button', { name: 'Save design' }).click();
  await expect(page.getByText('Saved.')).toBeVisible();

  // compare them through a shareable address
  await page.goto(`${base}/designs`);
  await page.getByLabel(`Compare ${first}`).check();
  await page.getByLabel(`Compare ${second}`).check();
  await page.getByRole('link', { name: /Compare \(2\)/ }).click();
  await expect(page).toHaveURL(/compare\?designs=\d+,\d+/);
  await expect(page.getByTestId('compare-table')).toContainText('Expected reversal rate if choices follow exponential');
  await expect(page.getByTestId('compare-table').locator('[data-best="true"]').first()).toBeVisible();
  await expect(page.getByTestId('compare-robustness-chart').locator('rect[data-series]')).toHaveCount(12); // six models × two designs
  const shared = page.url();
  await page.reload();
  await expect(page.getByRole('columnheader', { name: new RegExp(first) })).toBeVisible();
  expect(page.url()).toBe(shared);
  await page.screenshot(shot('planner-compare'));

  // freeze the first one, then comment
  await page.goto(`${base}/designs`);
  await page.getByRole('link', { name: first }).click();
  // with an unsaved edit, freezing is refused (it would store the saved draft without the edit);
  // the exact label, so the list page's "New design name" is never the field typed into
  await expect(page.getByTestId('design-title')).toHaveText(first);
  const name = page.getByLabel('Design name', { exact: true });
  await name.fill(`${first} (edited)`);
  await page.getByRole('button', { name: 'Freeze this design…' }).click();
  await expect(page.getByTestId('freeze-confirm')).toContainText('Save your edits first');
  await expect(page.getByTestId('freeze-confirm').getByRole('button', { name: /^Freeze version/ })).toHaveCount(0);
  await page.getByTestId('freeze-confirm').scrollIntoViewIfNeeded();
  await page.screenshot(shot('planner-freeze-unsaved'));
  await page.getByRole('button', { name: 'Back' }).click();
  await name.fill(first);
  // with the form saved, it asks for confirmation; Cancel freezes nothing
  await page.getByRole('button', { name: 'Freeze this design…' }).click();
  await expect(page.getByTestId('freeze-confirm')).toContainText('Freeze the saved draft as version 1?');
  await page.getByTestId('freeze-confirm').scrollIntoViewIfNeeded();
  await page.screenshot(shot('planner-freeze-confirm'));
  await page.getByRole('button', { name: 'Cancel' }).click();
  await expect(page.getByTestId('freeze-status')).toContainText('Not frozen yet');
  await page.getByRole('button', { name: 'Freeze this design…' }).click();
  await page.getByRole('button', { name: 'Freeze version 1' }).click();
  await expect(page.getByTestId('freeze-status')).toContainText('frozen as version 1');
  await expect(page.getByTestId('version-list')).toContainText(/[0-9a-f]{64}/);
  await page.getByLabel('Add a comment').fill('Frozen for the ethics submission.');
  await page.getByRole('button', { name: 'Post comment' }).click();
  await expect(page.getByTestId('comment-list')).toContainText('Frozen for the ethics submission.');
  await page.screenshot(shot('planner-frozen'));
});

test('the demo viewer sees the planner without edit controls, and the API refuses the viewer’s writes', async ({ page }) => {
  await signInAs(page, 'viewer');
  const base = await studyUrl(page);
  await page.goto(`${base}/priors`);
  await expect(page.getByTestId('prior-item').filter({ hasText: 'Harbourlight pilot' })).toBeVisible();
  await expect(page.getByRole('button', { name: 'New prior set' })).toHaveCount(0);
  await expect(page.getByRole('button', { name: /Save prior set|Create prior set/ })).toHaveCount(0);

  await page.goto(`${base}/designs`);
  await expect(page.getByTestId('design-row')).not.toHaveCount(0);
  await expect(page.getByRole('button', { name: 'Create design' })).toHaveCount(0);
  await expect(page.getByTestId('study-versions')).toContainText(/[0-9a-f]{64}/);
  await page.getByRole('link', { name: 'Personalised, two-week soon delay' }).click();
  await expect(page.getByTestId('stat-zone')).not.toHaveText('none');
  await expect(page.getByTestId('version-list')).toContainText(/[0-9a-f]{64}/);
  await expect(page.getByRole('button', { name: 'Save design' })).toHaveCount(0);
  await expect(page.getByRole('button', { name: /Freeze this design/ })).toHaveCount(0);
  await expect(page.getByText(/not a clinical assessment/).first()).toBeVisible();
  // viewers may take part in the discussion
  const remark = `Could the soon delay be shorter? ${Date.now()}`;
  await page.getByLabel('Add a comment').fill(remark);
  await page.getByRole('button', { name: 'Post comment' }).click();
  await expect(page.getByTestId('comment-list')).toContainText(remark);
  await page.screenshot(shot('planner-viewer'));
  // a viewer's fields are disabled and look it: dashed border, sunk background, a not-allowed cursor
  const amount = page.getByLabel('Large amount L');
  await expect(amount).toBeDisabled();
  const look = (el: HTMLElement) => ({ border: getComputedStyle(el).borderStyle, cursor: getComputedStyle(el).cursor, background: getComputedStyle(el).backgroundColor });
  const disabledLook = await amount.evaluate(look);
  expect(disabledLook).toMatchObject({ border: 'dashed', cursor: 'not-allowed' });
  expect(disabledLook.background).not.toBe(await page.getByLabel('Add a comment').evaluate((el) => getComputedStyle(el).backgroundColor));

  const studyId = base.split('/').pop();
  const write = await page.request.post(`/api/studies/${studyId}/priors`, { headers: writeHeaders(page), data: { name: 'Not allowed', medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 0 } });
  expect(write.status()).toBe(403);
  const designs = await (await page.request.get(`/api/studies/${studyId}/designs`)).json();
  const designId = designs.designs[0].id;
  expect((await page.request.post(`/api/studies/${studyId}/designs/${designId}/freeze`, { headers: writeHeaders(page) })).status()).toBe(403);
  expect((await page.request.put(`/api/studies/${studyId}/designs/${designId}`, { headers: writeHeaders(page), data: { spec: designs.designs[0].spec, version: designs.designs[0].version } })).status()).toBe(403);
  expect((await page.request.delete(`/api/studies/${studyId}/designs/${designId}`, { headers: writeHeaders(page) })).status()).toBe(403);
});

test('a stale design save is refused with an offer to reload, and the typed values are kept', async ({ page }) => {
  test.setTimeout(120_000);
  await signInAs(page, 'editor');
  const base = await studyUrl(page);
  const name = `Stale save ${Date.now()}`;
  await createDesign(page, base, name, 'Harbourlight pilot');
  const studyId = base.split('/').pop();
  const designId = page.url().split('/').pop();
  // someone else saves first
  const current = (await (await page.request.get(`/api/studies/${studyId}/designs/${designId}`)).json()).design;
  const other = await page.request.put(`/api/studies/${studyId}/designs/${designId}`, { headers: writeHeaders(page), data: { spec: { ...current.spec, probePairs: 7 }, version: current.version } });
  expect(other.status()).toBe(200);

  await page.getByLabel('Large amount L').fill('250');
  await page.getByRole('button', { name: 'Save design' }).click();
  await expect(page.getByText('Someone else saved this design first')).toBeVisible();
  await expect(page.getByLabel('Large amount L')).toHaveValue('250');
  await page.getByRole('button', { name: 'Load the current version' }).click();
  await expect(page.getByLabel('Reversal probes')).toHaveValue('7');
  await expect(page.getByLabel('Large amount L')).toHaveValue('250');
  await page.getByRole('button', { name: 'Save design' }).click();
  await expect(page.getByText('Saved.')).toBeVisible();
  const saved = (await (await page.request.get(`/api/studies/${studyId}/designs/${designId}`)).json()).design;
  expect(saved.spec).toMatchObject({ largeAmount: 250, probePairs: 7 });

  // leaving with unsaved changes asks first; staying keeps them
  await page.getByLabel('Large amount L').fill('300');
  let asked = '';
  page.once('dialog', (dialog) => {
    asked = dialog.message();
    void dialog.dismiss();
  });
  await page.getByRole('link', { name: '← All designs' }).click();
  await expect.poll(() => asked).toContain('unsaved changes');
  await expect(page.getByTestId('design-title')).toHaveText(name);
  await expect(page.getByLabel('Large amount L')).toHaveValue('300');
  page.once('dialog', (dialog) => void dialog.accept());
  await page.getByRole('link', { name: '← All designs' }).click();
  await expect(page).toHaveURL(/\/designs$/);
});
