// Local stand-ins for outside services, started by scripts/start.mjs and scripts/test.mjs after
// the database. `startServices(env)` receives the environment the app will get and returns
// `{ env, stop }`: extra variables for the app (where to send mail) and how to shut down.
//
// Mail: unless SMTP_URL names a real server, a fake SMTP server (scripts/fake-smtp.mjs) listens
// on 127.0.0.1:2525 (2526 for `npm test`; FAKE_SMTP_PORT overrides) and keeps every message in
// .data/mailbox (.data/mailbox-test), which the app shows on its mailbox page (MAILBOX_DIR).
import { rm } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { startFakeSmtp } from './fake-smtp.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const log = (message) => console.log(`[switchback] ${message}`);

/** @param {Record<string, string | undefined>} env */
export async function startServices(env) {
  if (env.SMTP_URL) {
    log('Mail goes to the SMTP server named by SMTP_URL; the local mailbox is off.');
    return { env: {}, stop: async () => {} };
  }
  const testing = env.SWITCHBACK_TEST === '1';
  const port = Number(env.FAKE_SMTP_PORT || (testing ? 2526 : 2525));
  const mailboxDir = path.join(ROOT, '.data', testing ? 'mailbox-test' : 'mailbox');
  if (testing) await rm(mailboxDir, { recursive: true, force: true }); // each test run starts with an empty mailbox
  const smtp = await startFakeSmtp({ port, mailboxDir });
  log(`Local test mail server on ${smtp.url}: messages are kept in ${path.relative(ROOT, mailboxDir)}, never delivered.`);
  return { env: { SMTP_URL: smtp.url, MAILBOX_DIR: mailboxDir }, stop: smtp.stop };
}
