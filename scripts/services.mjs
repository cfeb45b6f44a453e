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
import { startFakePayments } from './fake-payments.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const log = (message) => console.log(`[switchback] ${message}`);

/** @param {Record<string, string | undefined>} env */
export async function startServices(env) {
  const mail = await startMail(env);
  const payments = await startPayments(env);
  return {
    env: { ...mail.env, ...payments.env },
    stop: async () => {
      await Promise.all([mail.stop(), payments.stop()]);
    },
  };
}

// Payments: unless PAYMENT_API_URL names the real service, a fake of the payment provider's API
// (scripts/fake-payments.mjs) listens on 127.0.0.1:4079 (4080 for `npm test`; FAKE_PAYMENT_PORT
// overrides); the app's SDK client is pointed at it with its own base-path option.
/** @param {Record<string, string | undefined>} env */
async function startPayments(env) {
  if (env.PAYMENT_API_URL) {
    log('Payouts go to the payment service named by PAYMENT_API_URL.');
    return { env: {}, stop: async () => {} };
  }
  const testing = env.SWITCHBACK_TEST === '1';
  const port = Number(env.FAKE_PAYMENT_PORT || (testing ? 4080 : 4079));
  let fake;
  try {
    fake = await startFakePayments({ port });
  } catch (error) {
    // Test runs of several checkouts share the machine: without an explicit port, any free one will do.
    if (!testing || env.FAKE_PAYMENT_PORT) throw error;
    fake = await startFakePayments({ port: 0 });
  }
  log(`Local fake payment API on ${fake.basePath}: payouts are recorded there, never paid.`);
  return { env: { PAYMENT_API_URL: fake.basePath, PAYMENT_API_TOKEN: fake.token }, stop: fake.stop };
}

/** @param {Record<string, string | undefined>} env */
async function startMail(env) {
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
