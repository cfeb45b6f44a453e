// The local fake SMTP server, started in-process on a free port for a test file: real SMTP through
// nodemailer, real .eml files, read back the way the mailbox page reads them. No mocks.
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll } from 'vitest';
import { startFakeSmtp } from '@/scripts/fake-smtp.mjs';
import { listMailbox, type MailboxMessage } from '@/lib/server/mail/mailbox';

export type TestMailbox = {
  url: string;
  dir: string;
  /** Waits until a kept message matches (polling the folder), or fails after `timeoutMs`. */
  waitFor: (match: (m: MailboxMessage) => boolean, timeoutMs?: number) => Promise<MailboxMessage>;
  all: () => Promise<MailboxMessage[]>;
  stop: () => Promise<void>;
};

/** Starts the fake server and points SMTP_URL / MAILBOX_DIR at it for the app code under test. */
export async function startTestMailbox(): Promise<TestMailbox> {
  const dir = await mkdtemp(path.join(os.tmpdir(), 'switchback-mailbox-'));
  const smtp = await startFakeSmtp({ port: 0, mailboxDir: dir });
  const before = { SMTP_URL: process.env.SMTP_URL, MAILBOX_DIR: process.env.MAILBOX_DIR };
  process.env.SMTP_URL = smtp.url;
  process.env.MAILBOX_DIR = dir;
  const all = () => listMailbox(dir, { recipient: null, limit: 10_000 });
  return {
    url: smtp.url,
    dir,
    all,
    async waitFor(match, timeoutMs = 10_000) {
      const deadline = Date.now() + timeoutMs;
      for (;;) {
        const found = (await all()).find(match);
        if (found) return found;
        if (Date.now() > deadline) throw new Error(`no matching message arrived within ${timeoutMs} ms`);
        await new Promise((resolve) => setTimeout(resolve, 50));
      }
    },
    async stop() {
      // Later test files in the same worker get the environment they started with.
      for (const [key, value] of Object.entries(before)) {
        if (value === undefined) delete process.env[key];
        else process.env[key] = value;
      }
      await smtp.stop();
      await rm(dir, { recursive: true, force: true });
    },
  };
}

/** The first link in a message's text whose path starts with `prefix` (e.g. '/invitations/'). */
export function linkIn(message: MailboxMessage, prefix: string): URL {
  const found = message.text.match(/https?:\/\/\S+/g)?.map((raw) => new URL(raw)).find((u) => u.pathname.startsWith(prefix));
  if (!found) throw new Error(`no ${prefix} link in "${message.subject}"`);
  return found;
}

/** The token at the end of a link such as /invitations/<token>. */
export function tokenOf(url: URL): string {
  return url.pathname.split('/').filter(Boolean).pop()!;
}

/**
 * The test mailbox of one test file: started before the file's tests (with NEXTAUTH_URL set to
 * `linkBase`, the origin the mailed links point at, when given) and stopped after them, NEXTAUTH_URL
 * restored. Its methods may be used inside the tests (not at the top level of the file).
 */
export function mailboxOfFile(options: { linkBase?: string } = {}): Omit<TestMailbox, 'stop'> {
  let box: TestMailbox | null = null;
  const saved = process.env.NEXTAUTH_URL;
  beforeAll(async () => {
    if (options.linkBase) process.env.NEXTAUTH_URL = options.linkBase;
    box = await startTestMailbox();
  });
  afterAll(async () => {
    await box?.stop();
    if (saved === undefined) delete process.env.NEXTAUTH_URL;
    else process.env.NEXTAUTH_URL = saved;
  });
  const started = (): TestMailbox => {
    if (!box) throw new Error('the test mailbox starts before the first test');
    return box;
  };
  return {
    get url() {
      return started().url;
    },
    get dir() {
      return started().dir;
    },
    waitFor: (match, timeoutMs) => started().waitFor(match, timeoutMs),
    all: () => started().all(),
  };
}
