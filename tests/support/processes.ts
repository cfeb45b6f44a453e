// Child processes for the scale-out tests: queue workers (`npm run worker`) and app processes
// answering the participant-session API (lib/server/http/direct-api.ts, as scripts/serve.mjs does),
// each its own Node process against the test MariaDB and the test Redis.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';

const ROOT = path.resolve(import.meta.dirname, '..', '..');

/** The test Redis that scripts/test.mjs started (TEST_REDIS_URL). */
export function testRedisUrl(): string {
  const url = process.env.TEST_REDIS_URL;
  if (!url) throw new Error('TEST_REDIS_URL is not set: run these tests through scripts/test.mjs, which starts the test Redis');
  return url;
}

export type Child = { process: ChildProcess; output: () => string; waitFor: (pattern: RegExp, timeoutMs?: number) => Promise<RegExpMatchArray>; stop: () => Promise<void> };

/** Starts `node --import tsx <file> ...args` with `env` added; its output is kept for waitFor. */
export function startTsx(file: string, args: string[], env: Record<string, string>): Child {
  const child = spawn(process.execPath, ['--import', 'tsx', file, ...args], { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  let text = '';
  child.stdout!.on('data', (d) => (text += d));
  child.stderr!.on('data', (d) => (text += d));
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  return {
    process: child,
    output: () => text,
    async waitFor(pattern, timeoutMs = 60_000) {
      const deadline = Date.now() + timeoutMs;
      for (;;) {
        const match = pattern.exec(text);
        if (match) return match;
        if (child.exitCode !== null || child.signalCode !== null) throw new Error(`${file} exited (${child.exitCode ?? child.signalCode}) before printing ${pattern}:\n${text}`);
        if (Date.now() > deadline) throw new Error(`${file} did not print ${pattern} within ${timeoutMs} ms:\n${text}`);
        await new Promise((resolve) => setTimeout(resolve, 50));
      }
    },
    async stop() {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM');
      const forced = setTimeout(() => child.kill('SIGKILL'), 10_000);
      await exited;
      clearTimeout(forced);
    },
  };
}

/** A queue worker process with one thread and a short lock, so a killed worker's chunk is taken over quickly. */
export async function startQueueWorker(): Promise<Child> {
  const worker = startTsx('lib/server/jobs/worker-process.ts', ['--threads', '1', '--verbose'], { REDIS_URL: testRedisUrl(), QUEUE_LOCK_MS: '2000' });
  await worker.waitFor(/taking power chunks/);
  return worker;
}
