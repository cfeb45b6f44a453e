import { readFileSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import * as mariadb from 'mariadb';
import { expect, test } from '@playwright/test';
import { openDemoStudy, shot, signInAs } from './helpers';

// The starter experiment, downloaded with a new browser key, hosted by this test on another origin
// (a port of its own), runs a whole two-stage session against the production server in Chromium:
// cross-origin calls with CORS, the session token, a reload midway, and every answer in MariaDB.
const STARTER_PORT = Number(process.env.STARTER_PORT ?? 3140);
const STARTER_ORIGIN = `http://127.0.0.1:${STARTER_PORT}`;

let server: Server | null = null;
test.afterAll(async () => {
  await new Promise((resolve) => (server ? server.close(resolve) : resolve(null)));
});

test('a static starter page on another origin runs a whole session with a browser key, and the answers are in the database', async ({ page, browser }) => {
  test.setTimeout(180_000); // some 40 choices, each a round of the page and, in stage 2, a call
  await signInAs(page, 'operator');
  await openDemoStudy(page);
  const studyId = new URL(page.url()).pathname.split('/')[2];
  await page.getByRole('link', { name: 'API', exact: true }).click();
  await page.getByLabel('Key name').fill(`Public page ${Date.now()}`);
  const versionOption = page.getByLabel('Serves frozen version').locator('option', { hasText: 'personalised' }).first();
  await page.getByLabel('Serves frozen version').selectOption(await versionOption.getAttribute('value'));
  await page.getByLabel('Kind').selectOption('browser');
  await page.getByLabel('Allowed origins').fill(STARTER_ORIGIN);
  await page.getByRole('button', { name: 'Create key' }).click();
  await expect(page.getByTestId('new-secret')).toBeVisible();
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download starter experiment with this key' }).click()]);
  expect(download.suggestedFilename()).toMatch(/^switchback-starter-\d+-v\d+-[0-9a-f]{12}\.html$/);
  const html = readFileSync((await download.path())!, 'utf8');
  expect(html).not.toContain('PASTE-YOUR-BROWSER-KEY-HERE');
  await page.screenshot(shot('session-browser-key'));

  // The lab's own site: another origin, serving the file unchanged.
  server = createServer((_req, res) => res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' }).end(html));
  await new Promise<void>((resolve) => server!.listen(STARTER_PORT, '127.0.0.1', resolve));

  const participantId = `ST-${Date.now()}`;
  const context = await browser.newContext();
  const participant = await context.newPage();
  const apiCalls: Array<{ url: string; status: number; allowOrigin: string | undefined }> = [];
  participant.on('response', (r) => {
    if (r.url().includes('/api/v1/')) apiCalls.push({ url: r.url(), status: r.status(), allowOrigin: r.headers()['access-control-allow-origin'] });
  });
  await participant.goto(`${STARTER_ORIGIN}/experiment.html?participantId=${participantId}`);
  await participant.getByRole('button', { name: 'Start' }).click();
  let clicks = 0;
  for (;;) {
    const done = participant.getByTestId('done');
    // an item whose buttons take a click (after a click they stay disabled until the next item is shown)
    const option = participant.locator('button[data-choice]:not([disabled])').first();
    await expect(done.or(option)).toBeVisible({ timeout: 20_000 });
    if (await done.isVisible()) break;
    // a consistent chooser: later for the first magnitude's cheap delays, sooner otherwise (any answers will do for the plumbing)
    const choice = clicks % 3 === 0 ? 'sooner' : 'later';
    await participant.locator(`button[data-choice="${choice}"]:not([disabled])`).click();
    clicks++;
    if (clicks === 6) {
      await participant.reload(); // resumes where the participant was
      await expect(participant.getByRole('button', { name: 'Start' })).toHaveCount(0);
    }
    if (clicks === 3) await participant.screenshot(shot('session-starter-choice'));
    expect(clicks).toBeLessThan(200);
  }
  await participant.screenshot(shot('session-starter-done'));

  // Every call crossed origins and carried the matching CORS header.
  expect(apiCalls.length).toBeGreaterThan(3);
  expect(apiCalls.every((c) => c.status === 200 && c.allowOrigin === STARTER_ORIGIN)).toBe(true);
  expect(apiCalls.some((c) => c.url.includes('/stage2-answers'))).toBe(true);

  const conn = await mariadb.createConnection({ host: process.env.DB_HOST, port: Number(process.env.DB_PORT), user: process.env.DB_USER, password: process.env.DB_PASSWORD, database: process.env.DB_NAME });
  try {
    const [served] = await conn.query("SELECT id, JSON_LENGTH(result, '$.items') AS n, source FROM participants WHERE study_id = ? AND participant_id = ?", [Number(studyId), participantId]);
    expect(served.source).toBe('api');
    const answers = await conn.query('SELECT item_id, chosen, response_ms, side_shown, source FROM stage2_answers WHERE participant_ref = ?', [served.id]);
    expect(answers).toHaveLength(Number(served.n));
    expect(answers.every((a: { response_ms: number | null; side_shown: string | null; source: string }) => a.response_ms !== null && a.side_shown !== null && a.source === 'api')).toBe(true);
    const [session] = await conn.query('SELECT status, token_hash FROM participant_sessions WHERE study_id = ? AND participant_id = ?', [Number(studyId), participantId]);
    expect(session.status).toBe('completed');
    expect(session.token_hash).toMatch(/^[0-9a-f]{64}$/);
  } finally {
    await conn.end();
  }

  // The operator sees the completed session on the participants page.
  await page.getByRole('link', { name: 'Participants' }).click();
  await expect(page.getByTestId('participant-row').filter({ hasText: participantId })).toContainText('completed');
  await page.screenshot(shot('session-status'));
  await context.close();
});
