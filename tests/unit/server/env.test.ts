import { afterEach, describe, expect, it, vi } from 'vitest';

// The one module that reads settings (lib/server/env.ts). Each case sets the environment, imports a
// fresh copy of the module (the database and auth groups are parsed once per process) and restores.
const NAMES = ['DB_HOST', 'DB_PORT', 'DB_NAME', 'DB_USER', 'DB_PASSWORD', 'DB_SOCKET', 'NEXTAUTH_SECRET', 'NEXTAUTH_URL', 'SMTP_URL', 'MAIL_FROM', 'MAILBOX_DIR', 'PROBE_API_BURST', 'PROBE_API_PER_SECOND', 'BROWSER_API_BURST', 'BROWSER_API_PER_SECOND', 'POWER_WORKERS', 'SESSION_PAGE_BURST', 'SESSION_PAGE_PER_SECOND'];
const saved = Object.fromEntries(NAMES.map((n) => [n, process.env[n]]));

async function envWith(values: Record<string, string | undefined>) {
  for (const n of NAMES) delete process.env[n];
  for (const [k, v] of Object.entries(values)) if (v !== undefined) process.env[k] = v;
  vi.resetModules();
  return import('@/lib/server/env');
}

afterEach(() => {
  for (const n of NAMES) {
    if (saved[n] === undefined) delete process.env[n];
    else process.env[n] = saved[n];
  }
});

describe('server settings', () => {
  it('refuses missing database settings, naming each one', async () => {
    const env = await envWith({ DB_NAME: 'switchback' });
    expect(() => env.databaseEnv()).toThrow(/DB_USER.*DB_PASSWORD/);
  });

  it('reads the database settings with their defaults, and refuses a port out of range', async () => {
    expect((await envWith({ DB_NAME: 'n', DB_USER: 'u', DB_PASSWORD: 'p' })).databaseEnv()).toEqual({ DB_HOST: '127.0.0.1', DB_PORT: 3307, DB_NAME: 'n', DB_USER: 'u', DB_PASSWORD: 'p' });
    await expect(envWith({ DB_NAME: 'n', DB_USER: 'u', DB_PASSWORD: 'p', DB_PORT: '70000' }).then((e) => e.databaseEnv())).rejects.toThrow('DB_PORT');
    expect((await envWith({ DB_NAME: 'n', DB_USER: 'u', DB_PASSWORD: 'p', DB_SOCKET: '/run/db.sock' })).databaseEnv()).toMatchObject({ DB_SOCKET: '/run/db.sock' });
  });

  it('refuses a session secret shorter than 16 characters', async () => {
    await expect(envWith({ NEXTAUTH_SECRET: 'short' }).then((e) => e.authEnv())).rejects.toThrow('NEXTAUTH_SECRET must be at least 16 characters');
  });

  it('reads mail settings on every call, trimmed, with the default sender and link base', async () => {
    const env = await envWith({});
    expect(env.mailEnv()).toEqual({ SMTP_URL: undefined, MAIL_FROM: 'Switchback <no-reply@switchback.local>', MAILBOX_DIR: undefined, NEXTAUTH_URL: 'http://127.0.0.1:3000' });
    process.env.SMTP_URL = ' smtp://127.0.0.1:2525 ';
    process.env.NEXTAUTH_URL = 'https://lab.example/switchback//';
    process.env.MAIL_FROM = '  ';
    expect(env.mailEnv()).toMatchObject({ SMTP_URL: 'smtp://127.0.0.1:2525', NEXTAUTH_URL: 'https://lab.example/switchback', MAIL_FROM: 'Switchback <no-reply@switchback.local>' });
  });

  it('falls back to the documented rate limit and worker defaults for unusable values', async () => {
    const env = await envWith({ PROBE_API_BURST: '-5', PROBE_API_PER_SECOND: 'x', POWER_WORKERS: '0', SESSION_PAGE_BURST: '0', SESSION_PAGE_PER_SECOND: 'fast' });
    expect(env.probeApiEnv()).toEqual({ PROBE_API_BURST: 200, PROBE_API_PER_SECOND: 100, BROWSER_API_BURST: 120, BROWSER_API_PER_SECOND: 30, SESSION_PAGE_BURST: 120, SESSION_PAGE_PER_SECOND: 10 });
    expect(env.powerEnv().POWER_WORKERS).toBeUndefined();
    process.env.PROBE_API_BURST = '5';
    process.env.POWER_WORKERS = '40';
    expect(env.probeApiEnv().PROBE_API_BURST).toBe(5);
    expect(env.powerEnv().POWER_WORKERS).toBe(16);
  });
});
