import { defineConfig } from '@playwright/test';

// Browser tests run against a production build that scripts/test.mjs starts (BASE_URL), using
// the system Chromium from Debian: Playwright's own browser download is never used.
export default defineConfig({
  testDir: 'tests/browser',
  outputDir: 'tests/artifacts/browser',
  workers: 1,
  fullyParallel: false,
  retries: process.env.CI ? 1 : 0,
  forbidOnly: Boolean(process.env.CI),
  reporter: 'list',
  timeout: 60_000,
  expect: { timeout: 15_000 },
  use: {
    baseURL: process.env.BASE_URL || 'http://127.0.0.1:3100',
    browserName: 'chromium',
    screenshot: 'on',
    trace: 'retain-on-failure',
    launchOptions: {
      executablePath: '/usr/bin/chromium',
      args: [
        '--no-sandbox',
        '--disable-gpu',
        '--disable-quic',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
        '--disable-dev-shm-usage',
        '--no-first-run',
      ],
    },
  },
});
