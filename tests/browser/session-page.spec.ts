import { createServer, type Server } from 'node:http';
import * as mariadb from 'mariadb';
import { expect, test, type Page } from '@playwright/test';
import { openDemoStudy, shot, signInAs } from './helpers';

// Switchback's own session page in Chromium: an operator creates a participant link, a participant
// opens it with their panel id, consents, answers part of the calibration block, reloads and
// resumes at the same item, double-clicks once (one answer recorded), finishes both blocks, sees
// the completion code and is redirected with their id to the panel's address (served here, on a
// port of this test's own). A preview stores nothing; a paused link says so.
const PANEL_PORT = Number(process.env.SESSION_PANEL_PORT ?? 4210);
const PANEL = `http://127.0.0.1:${PANEL_PORT}`;

let panel: Server | null = null;
const panelHits: string[] = [];
test.afterAll(async () => {
  await new Promise((resolve) => (panel ? panel.close(resolve) : resolve(null)));
});

async function database() {
  return mariadb.createConnection({ host: process.env.DB_HOST, port: Number(process.env.DB_PORT), user: process.env.DB_USER, password: process.env.DB_PASSWORD, database: process.env.DB_NAME });
}

async function createLink(page: Page, name: string) {
  await page.getByRole('link', { name: 'Session links', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'New participant link' })).toBeVisible();
  await page.getByLabel('Link name').fill(name);
  const versionOption = page.getByLabel('Runs frozen version').locator('option', { hasText: 'personalised' }).first();
  await page.getByLabel('Runs frozen version').selectOption(await versionOption.getAttribute('value'));
  await page.getByLabel('Title participants see').fill('Choices about money and time');
  await page.getByLabel('Consent text').fill('Harbourlight Decision Lab asks you to make choices between amounts of money.\nTaking part is voluntary.');
  await page.getByLabel('Instructions').fill('Each question offers two amounts. Choose the one you would rather have.');
  await page.getByLabel('Completion code').fill('HARBOUR-7');
  await page.getByLabel('Redirect URL (optional)').fill(`${PANEL}/done`);
  await page.getByRole('button', { name: 'Create link' }).click();
  const card = page.getByTestId('session-link').filter({ has: page.getByText(name) }).or(page.locator('section', { hasText: name }).getByTestId('session-link')).first();
  await expect(card).toBeVisible();
  const url = (await card.getByTestId('link-url').textContent())!;
  return { card, url };
}

/** The item on screen, once its options take a click. */
async function currentItem(page: Page) {
  await expect(page.locator('button[data-option]:not([disabled])').first()).toBeVisible({ timeout: 20_000 });
  return page.getByTestId('choice-step').getAttribute('data-item-id');
}

/** The item on screen now, or 'done' when there is none (the completion step). */
const itemOrDone = (page: Page) => page.getByTestId('choice-step').getAttribute('data-item-id', { timeout: 500 }).catch(() => 'done');

test('a participant runs the session page from the link to the completion code and the redirect, resuming after a reload', async ({ page, browser }) => {
  test.setTimeout(240_000);
  panel = createServer((req, res) => {
    panelHits.push(req.url ?? '');
    res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' }).end('<!doctype html><title>Panel</title><h1>Back at the panel</h1>');
  });
  await new Promise<void>((resolve) => panel!.listen(PANEL_PORT, '127.0.0.1', resolve));

  await signInAs(page, 'operator');
  await openDemoStudy(page);
  const studyId = Number(new URL(page.url()).pathname.split('/')[2]);
  const { url } = await createLink(page, `Panel wave ${Date.now()}`);
  await page.screenshot(shot('session-links-desktop'));
  const participantId = `BR-${Date.now()}`;
  const link = url.replace('PARTICIPANT_ID', participantId);

  const context = await browser.newContext();
  const participant = await context.newPage();
  await participant.goto(link);
  await expect(participant.getByRole('heading', { name: 'Consent' })).toBeVisible();
  await expect(participant.getByText('Taking part is voluntary.')).toBeVisible();
  await expect(participant.getByText('not a test or an assessment of you')).toBeVisible();
  await participant.getByRole('button', { name: 'I agree and take part' }).click();
  await expect(participant.getByRole('heading', { name: 'Instructions' })).toBeVisible();
  await participant.getByRole('button', { name: 'Start' }).click();

  const conn = await database();
  try {
    const answersSoFar = async () => {
      const [row] = await conn.query('SELECT calibration_answers AS a FROM participant_sessions WHERE study_id = ? AND participant_id = ?', [studyId, participantId]);
      return Object.keys(typeof row.a === 'string' ? JSON.parse(row.a) : (row.a ?? {})).length;
    };
    // keyboard: the first answers by the arrow keys (focus is on the question)
    const first = await currentItem(participant);
    await expect(participant.getByRole('heading', { name: 'Which would you rather have?' })).toBeFocused();
    await participant.keyboard.press('ArrowRight');
    await expect.poll(() => currentItem(participant)).not.toBe(first);
    await participant.screenshot(shot('session-page-choice-desktop'));
    // two more by clicking
    for (let i = 0; i < 2; i++) {
      const before = await currentItem(participant);
      await participant.locator('button[data-option="later"]:not([disabled])').click();
      await expect.poll(() => currentItem(participant)).not.toBe(before);
    }
    expect(await answersSoFar()).toBe(3);
    // a reload resumes at the same item, with the progress as it was
    const beforeReload = await currentItem(participant);
    const progress = await participant.getByTestId('choice-progress').textContent();
    await participant.reload();
    expect(await currentItem(participant)).toBe(beforeReload);
    await expect(participant.getByTestId('choice-progress')).toHaveText(progress!);
    // a double click records one answer and moves on by one item
    await participant.locator('button[data-option="sooner"]:not([disabled])').dblclick();
    await expect.poll(() => currentItem(participant)).not.toBe(beforeReload);
    await expect(participant.getByTestId('choice-progress')).toHaveText(/^Question 5 of/);
    expect(await answersSoFar()).toBe(4);

    // a second tab shares the session: it opens at the same item; after it answers, the first tab's
    // click is refused and the first tab shows the item the session is really on
    const second = await context.newPage();
    await second.goto(link);
    const shared = await currentItem(second);
    expect(shared).toBe(await currentItem(participant));
    await second.locator('button[data-option="later"]:not([disabled])').click();
    await expect.poll(() => currentItem(second)).not.toBe(shared);
    const moved = await currentItem(second);
    await participant.locator('button[data-option="sooner"]:not([disabled])').click();
    await expect(participant.getByText('This page had fallen behind')).toBeVisible();
    expect(await currentItem(participant)).toBe(moved);
    await second.close();
    expect(await answersSoFar()).toBe(5);

    // a lost connection: the answer waits, is sent again when the connection is back, and is recorded once
    const offlineItem = await currentItem(participant);
    await context.setOffline(true);
    await participant.locator('button[data-option="later"]:not([disabled])').click();
    await expect(participant.getByText('The connection was lost')).toBeVisible();
    expect(await answersSoFar()).toBe(5);
    await context.setOffline(false);
    await expect.poll(() => currentItem(participant), { timeout: 20_000 }).not.toBe(offlineItem);
    await expect(participant.getByText('The connection was lost')).toHaveCount(0);
    expect(await answersSoFar()).toBe(6);

    // the phone: no sideways scrolling at 375 px
    await participant.setViewportSize({ width: 375, height: 740 });
    await currentItem(participant);
    expect(await participant.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(375);
    await participant.screenshot(shot('session-page-choice-phone'));
    await participant.setViewportSize({ width: 1280, height: 800 });

    // both blocks to the end, with no break: the attention checks answered with the dominant option
    let clicks = 0;
    for (;;) {
      const done = participant.getByTestId('completion-step');
      const option = participant.locator('button[data-option]:not([disabled])').first();
      await expect(done.or(option)).toBeVisible({ timeout: 20_000 });
      if (await done.isVisible()) break;
      const item = await currentItem(participant);
      await participant.locator(`button[data-option="${item?.startsWith('check-') || clicks % 3 === 0 ? 'sooner' : 'later'}"]:not([disabled])`).click();
      await expect.poll(() => itemOrDone(participant)).not.toBe(item);
      clicks++;
      expect(clicks).toBeLessThan(200);
    }
    await expect(participant.getByTestId('completion-code')).toHaveText('HARBOUR-7');
    await participant.screenshot(shot('session-page-complete-desktop'));
    await participant.setViewportSize({ width: 375, height: 740 });
    expect(await participant.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(375);
    await participant.screenshot(shot('session-page-complete-phone'));

    const [served] = await conn.query("SELECT id, source, JSON_LENGTH(result, '$.items') AS n FROM participants WHERE study_id = ? AND participant_id = ?", [studyId, participantId]);
    expect(served.source).toBe('page');
    const [{ n: answered }] = await conn.query('SELECT COUNT(*) AS n FROM stage2_answers WHERE participant_ref = ? AND source = ?', [served.id, 'page']);
    expect(Number(answered)).toBe(Number(served.n));
    const [session] = await conn.query('SELECT status FROM participant_sessions WHERE study_id = ? AND participant_id = ?', [studyId, participantId]);
    expect(session.status).toBe('completed');

    await participant.getByTestId('completion-continue').click();
    await participant.waitForURL(`${PANEL}/done?pid=${participantId}`);
    await expect(participant.getByRole('heading', { name: 'Back at the panel' })).toBeVisible();
    expect(panelHits).toContain(`/done?pid=${participantId}`);
  } finally {
    await conn.end();
    await context.close();
  }
});

test('a preview runs the link without any record, and a paused link tells participants so', async ({ page, browser }) => {
  test.setTimeout(180_000);
  await signInAs(page, 'operator');
  await openDemoStudy(page);
  const studyId = Number(new URL(page.url()).pathname.split('/')[2]);
  const name = `Preview wave ${Date.now()}`;
  const { card, url } = await createLink(page, name);
  const conn = await database();
  try {
    const count = async () => {
      const [row] = await conn.query('SELECT (SELECT COUNT(*) FROM participant_sessions WHERE study_id = ?) AS s, (SELECT COUNT(*) FROM participants WHERE study_id = ?) AS p, (SELECT COUNT(*) FROM stage2_answers WHERE study_id = ?) AS a', [studyId, studyId, studyId]);
      return { sessions: Number(row.s), participants: Number(row.p), answers: Number(row.a) };
    };
    const before = await count();
    await card.getByRole('link', { name: 'Preview' }).click();
    await expect(page.getByText('Nothing is recorded')).toBeVisible();
    await page.getByRole('button', { name: 'I agree and take part' }).click();
    await page.getByRole('button', { name: 'Start' }).click();
    let clicks = 0;
    for (;;) {
      const done = page.getByTestId('completion-step');
      const option = page.locator('button[data-option]:not([disabled])').first();
      await expect(done.or(option)).toBeVisible({ timeout: 20_000 });
      if (await done.isVisible()) break;
      const item = await page.getByTestId('choice-step').getAttribute('data-item-id');
      await page.locator(`button[data-option="${item?.startsWith('check-') ? 'sooner' : 'later'}"]:not([disabled])`).click();
      await expect.poll(() => itemOrDone(page)).not.toBe(item);
      clicks++;
      expect(clicks).toBeLessThan(200);
    }
    await expect(page.getByTestId('completion-code')).toHaveText('HARBOUR-7');
    await page.screenshot(shot('session-page-preview'));
    expect(await count()).toEqual(before);

    // pause the link: a participant is told, and nothing is recorded
    await page.goBack();
    await page.goto(`/studies/${studyId}/session-links`);
    const linkCard = page.locator('section').filter({ hasText: name });
    await linkCard.getByRole('button', { name: 'Pause' }).click();
    await expect(linkCard.getByTestId('link-status')).toHaveText('paused');
    const context = await browser.newContext();
    const participant = await context.newPage();
    await participant.goto(url.replace('PARTICIPANT_ID', `PAUSED-${Date.now()}`));
    await expect(participant.getByText('This study is paused')).toBeVisible();
    await participant.screenshot(shot('session-page-paused'));
    await context.close();
    expect(await count()).toEqual(before);
  } finally {
    await conn.end();
  }
});
