// The security headers as a browser meets them: no other origin can frame the app, and the pages
// still draw their charts, load their fonts and download the power figure under the content
// security policy, with no violation reported. Also: headers on both serving paths, 400 for
// paths with malformed percent-escapes, and no redirect to another host after signing in.
import { createServer, type Server } from 'node:http';
import { readFileSync } from 'node:fs';
import { expect, test, type Page } from '@playwright/test';
import { demoAccount, openDemoStudy, signInAs } from './helpers';

// A page on another port of the same host (the attacker's), from this worktree's own port range.
const OTHER_PORT = Number(process.env.OTHER_ORIGIN_PORT ?? 3130);

/** Records every CSP violation the page reports, as events and as console messages. */
async function watchViolations(page: Page) {
  const seen: string[] = [];
  page.on('console', (message) => {
    if (/Content Security Policy|Refused to/i.test(message.text())) seen.push(message.text());
  });
  await page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (event) => {
      console.error(`Refused to load (CSP violation): ${event.violatedDirective} ${event.blockedURI}`);
    });
  });
  return seen;
}

test.describe('security headers in the browser', () => {
  let attacker: Server;
  test.beforeAll(async ({ baseURL }) => {
    attacker = createServer((_request, response) => {
      response.writeHead(200, { 'content-type': 'text/html' });
      response.end(`<!doctype html><title>Elsewhere</title><h1>Another page</h1><iframe id="victim" src="${baseURL}/sign-in" width="800" height="600"></iframe>`);
    });
    await new Promise<void>((resolve) => attacker.listen(OTHER_PORT, '127.0.0.1', resolve));
  });
  test.afterAll(async () => {
    await new Promise((resolve) => attacker.close(resolve));
  });

  test('a page from another origin cannot frame the app', async ({ page }) => {
    const messages: string[] = [];
    page.on('console', (message) => messages.push(message.text()));
    await page.goto(`http://127.0.0.1:${OTHER_PORT}/`);
    await expect(page.getByRole('heading', { name: 'Another page' })).toBeVisible();
    const frame = page.frameLocator('#victim');
    await page.waitForTimeout(1500); // the frame's navigation settles (blocked or not) well within this
    await expect(frame.getByRole('button', { name: 'Sign in' })).toHaveCount(0);
    await expect(frame.getByLabel('Password')).toHaveCount(0);
    expect(messages.join('\n')).toMatch(/frame-ancestors 'none'/);
  });

  test('charts draw, fonts load and the power figure downloads with no policy violation', async ({ page }) => {
    test.setTimeout(120_000);
    const violations = await watchViolations(page);
    await signInAs(page, 'editor');
    await openDemoStudy(page);
    const base = page.url().match(/\/studies\/\d+/)![0];

    await page.goto(`${base}/priors`);
    await expect(page.getByTestId('prior-scatter').locator('path[data-series]').first()).toBeVisible();

    await page.goto(`${base}/designs`);
    await page.getByTestId('design-row').first().getByRole('link').click();
    await expect(page.getByTestId('gap-chart').locator('path').first()).toBeVisible({ timeout: 20_000 });
    await expect(page.getByTestId('value-chart').locator('path').first()).toBeVisible();
    const fonts = await page.evaluate(async () => {
      await document.fonts.ready;
      return [...document.fonts].filter((f) => f.status === 'loaded').length;
    });
    expect(fonts, 'the shipped fonts load under font-src').toBeGreaterThan(0);

    await page.goto(`${base}/power`);
    await page.getByRole('link', { name: /\(demo\)$/ }).first().click(); // the seeded finished run
    await expect(page.getByTestId('power-chart').locator('svg')).toBeVisible({ timeout: 30_000 });
    const [png] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download PNG (300 dpi)' }).click()]);
    expect(readFileSync((await png.path())!).subarray(1, 4).toString()).toBe('PNG');
    const [svg] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download SVG' }).click()]);
    expect(readFileSync((await svg.path())!, 'utf8')).toContain('<svg');

    expect(violations, 'no content security policy violation').toEqual([]);
  });

  test('pages carry a nonce-based policy that their own scripts use', async ({ request }) => {
    const response = await request.get('/sign-in');
    const policy = response.headers()['content-security-policy'] ?? '';
    expect(policy).toContain("frame-ancestors 'none'");
    const nonce = /'nonce-([^']+)'/.exec(policy)?.[1];
    expect(nonce, 'script-src names a nonce').toBeTruthy();
    expect(policy).not.toMatch(/script-src[^;]*'unsafe-inline'/);
    const html = await response.text();
    const scripts = html.match(/<script\b[^>]*>/g) ?? [];
    expect(scripts.length).toBeGreaterThan(0);
    for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`);
    const again = (await request.get('/sign-in')).headers()['content-security-policy'];
    expect(again, 'a fresh nonce per request').not.toBe(policy);
  });

  test('pages and API replies carry the headers on both serving paths, HSTS only over https', async ({ request }) => {
    const replies = {
      page: await request.get('/sign-in'),
      api: await request.get('/api/health'),
      unauthenticated: await request.get('/api/studies'),
      direct: await request.post('/api/v1/studies/1/probe-items', { data: {} }),
    };
    expect(replies.direct.headers()['x-switchback-path']).toBe('direct');
    for (const [name, reply] of Object.entries(replies)) {
      const headers = reply.headers();
      expect(headers['x-content-type-options'], name).toBe('nosniff');
      expect(headers['referrer-policy'], name).toBe('same-origin');
      expect(headers['content-security-policy'], name).toContain("frame-ancestors 'none'");
      expect(headers['strict-transport-security'], `${name} over http`).toBeUndefined();
    }
    const https = { 'x-forwarded-proto': 'https' };
    expect((await request.get('/sign-in', { headers: https })).headers()['strict-transport-security']).toMatch(/max-age=\d+/);
    expect((await request.post('/api/v1/studies/1/probe-items', { data: {}, headers: https })).headers()['strict-transport-security']).toMatch(/max-age=\d+/);
  });

  test('a path with a malformed percent-escape gets 400, on pages, the API and the direct path', async ({ request }) => {
    for (const path of ['/studies/%E0%A4%A', '/%zz', '/sign-in/%', '/api/studies/%E0%A4%A', '/api/studies/1/designs/%zz', '/api/v1/studies/%zz/probe-items']) {
      for (const method of ['GET', 'POST'] as const) {
        const reply = await request.fetch(path, { method, data: method === 'POST' ? {} : undefined });
        expect(reply.status(), `${method} ${path}`).toBe(400);
        expect(reply.headers()['x-content-type-options']).toBe('nosniff');
      }
    }
  });

  test('signing in with a callback to another host lands on the study list', async ({ page }) => {
    for (const callback of ['/\\127.0.0.1:3130/', '//127.0.0.1:3130/', '/%5C127.0.0.1:3130/', '/\t/127.0.0.1:3130/']) {
      await page.context().clearCookies();
      await page.goto(`/sign-in?callbackUrl=${encodeURIComponent(callback)}`);
      await page.getByLabel('E-mail').fill(demoAccount('viewer').email);
      await page.getByLabel('Password').fill(demoAccount('viewer').password);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await expect(page.getByRole('heading', { name: 'Your studies' })).toBeVisible();
      expect(new URL(page.url()).port, callback).not.toBe(String(OTHER_PORT));
    }
  });
});
