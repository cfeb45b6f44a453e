import * as mariadb from 'mariadb';
import { expect, test, type Page } from '@playwright/test';
import { openDemoStudy, shot, signInAs } from './helpers';

// Adaptive calibration end to end in Chromium (issue 17): an editor turns on "Adaptive calibration"
// in the design form (its help line and stop rule), freezes the design, makes a participant link for
// it, and a participant runs the session page: the calibration questions come one at a time from the
// adaptive candidate set (ids acal-…), at most the design's number of them, then the stage-2 block,
// then the completion code; the served estimates are the posterior's.
async function database() {
  return mariadb.createConnection({ host: process.env.DB_HOST, port: Number(process.env.DB_PORT), user: process.env.DB_USER, password: process.env.DB_PASSWORD, database: process.env.DB_NAME });
}

const itemOrDone = (page: Page) => page.getByTestId('choice-step').getAttribute('data-item-id', { timeout: 500 }).catch(() => 'done');

test('a design with adaptive calibration runs on the session page, one chosen question at a time', async ({ page, browser }) => {
  test.setTimeout(300_000);
  await signInAs(page, 'editor');
  await openDemoStudy(page);
  const studyId = Number(new URL(page.url()).pathname.split('/')[2]);
  const base = `/studies/${studyId}`;
  const name = `Adaptive wave ${Date.now()}`;

  // the design form: the option, its help line and its stop rule
  await page.goto(`${base}/designs`);
  await page.getByLabel('New design name').fill(name);
  await page.getByLabel('Prior set for the new design').selectOption({ label: 'Harbourlight pilot' });
  await page.getByRole('button', { name: 'Create design' }).click();
  await expect(page.getByTestId('design-title')).toHaveText(name, { timeout: 20_000 });
  await page.waitForLoadState('networkidle');
  await page.getByRole('checkbox', { name: /Adaptive calibration/ }).check();
  await expect(page.getByText('expected to tell most about their rates')).toBeVisible();
  await page.getByLabel('Most adaptive items (both magnitudes)').fill('1');
  await page.getByRole('button', { name: 'Save design' }).click();
  await expect(page.getByText('Ask at least 2 adaptive calibration items.')).toBeVisible();
  await page.getByLabel('Most adaptive items (both magnitudes)').fill('6');
  await page.getByLabel('Stop at posterior SD of ln k and ln K').fill('0');
  await page.getByRole('button', { name: 'Save design' }).click();
  await expect(page.getByText('Saved.')).toBeVisible();
  await page.getByLabel('Most adaptive items (both magnitudes)').scrollIntoViewIfNeeded();
  await page.screenshot(shot('design-adaptive-calibration'));
  await page.getByRole('button', { name: 'Freeze this design…' }).click();
  await page.getByRole('button', { name: 'Freeze version 1' }).click();
  await expect(page.getByTestId('freeze-status')).toContainText('frozen as version 1');

  // a participant link for the frozen version
  await page.goto(`${base}/session-links`);
  await expect(page.getByRole('heading', { name: 'New participant link' })).toBeVisible();
  await page.getByLabel('Link name').fill(name);
  const option = page.getByLabel('Runs frozen version').locator('option', { hasText: name }).first();
  await page.getByLabel('Runs frozen version').selectOption(await option.getAttribute('value'));
  await page.getByLabel('Title participants see').fill('Choices about money and time');
  await page.getByLabel('Consent text').fill('Harbourlight Decision Lab asks you to make choices between amounts of money.\nTaking part is voluntary.');
  await page.getByLabel('Instructions').fill('Each question offers two amounts. Choose the one you would rather have.');
  await page.getByLabel('Completion code').fill('ADAPT-6');
  await page.getByRole('button', { name: 'Create link' }).click();
  const card = page.locator('section', { hasText: name }).getByTestId('session-link').first();
  await expect(card).toBeVisible();
  const participantId = `AD-${Date.now()}`;
  const url = (await card.getByTestId('link-url').textContent())!.replace('PARTICIPANT_ID', participantId);

  const context = await browser.newContext();
  const participant = await context.newPage();
  const conn = await database();
  try {
    await participant.goto(url);
    await participant.getByRole('button', { name: 'I agree and take part' }).click();
    await participant.getByRole('button', { name: 'Start' }).click();
    const asked: string[] = [];
    let clicks = 0;
    for (;;) {
      const done = participant.getByTestId('completion-step');
      const next = participant.locator('button[data-option]:not([disabled])').first();
      await expect(done.or(next)).toBeVisible({ timeout: 20_000 });
      if (await done.isVisible()) break;
      const item = (await participant.getByTestId('choice-step').getAttribute('data-item-id'))!;
      asked.push(item);
      if (asked.length === 2) await participant.screenshot(shot('session-page-adaptive-choice'));
      await participant.locator(`button[data-option="${item.startsWith('check-') || clicks % 2 === 0 ? 'sooner' : 'later'}"]:not([disabled])`).click();
      await expect.poll(() => itemOrDone(participant)).not.toBe(item);
      clicks++;
      expect(clicks).toBeLessThan(100);
    }
    await expect(participant.getByTestId('completion-code')).toHaveText('ADAPT-6');
    const calibration = asked.filter((id) => id.startsWith('acal-'));
    expect(calibration).toHaveLength(6);
    expect(asked.slice(0, 6)).toEqual(calibration);
    expect(new Set(calibration).size).toBe(6);
    const [served] = await conn.query("SELECT source, JSON_EXTRACT(result, '$.estimates.kSmall.standardErrorLog') AS se, JSON_LENGTH(responses) AS n FROM participants WHERE study_id = ? AND participant_id = ?", [studyId, participantId]);
    expect(served.source).toBe('page');
    expect(Number(served.n)).toBe(6);
    expect(Number(served.se)).toBeGreaterThan(0);
    const [session] = await conn.query('SELECT status FROM participant_sessions WHERE study_id = ? AND participant_id = ?', [studyId, participantId]);
    expect(session.status).toBe('completed');
  } finally {
    await conn.end();
    await context.close();
  }
});
