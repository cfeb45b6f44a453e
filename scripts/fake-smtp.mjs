// A local stand-in for an outgoing mail server: accepts SMTP on loopback and keeps each message as
// an .eml file in a mailbox folder, which the app's mailbox page reads. The app and this server are
// separate processes, so the folder (written atomically: temp file, then rename) is their only link.
//
//   node scripts/fake-smtp.mjs [--port 2525] [--dir .data/mailbox]     run on its own
//   import { startFakeSmtp } from './fake-smtp.mjs'                      start in-process (tests, services)
import { randomBytes } from 'node:crypto';
import { createWriteStream } from 'node:fs';
import { mkdir, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { SMTPServer } from 'smtp-server';

const MAX_MESSAGE_BYTES = 5 * 1024 * 1024;

/** A file name that sorts by arrival time: 20261202T031500123Z-ab12cd34.eml */
function messageName() {
  const stamp = new Date().toISOString().replace(/[-:.]/g, '');
  return `${stamp}-${randomBytes(4).toString('hex')}.eml`;
}

/** Writes one incoming message to `dir`, appearing only once complete. */
function keepMessage(stream, dir, callback) {
  const name = messageName();
  const temp = path.join(dir, `.incoming-${name}`);
  const out = createWriteStream(temp);
  stream.pipe(out);
  out.on('finish', async () => {
    if (stream.sizeExceeded) {
      await rm(temp, { force: true });
      const error = new Error('Message is larger than the local mailbox accepts (5 MB).');
      error.responseCode = 552;
      callback(error);
      return;
    }
    try {
      await rename(temp, path.join(dir, name));
      callback(null, `Kept as ${name}`);
    } catch (error) {
      callback(error);
    }
  });
  out.on('error', (error) => {
    stream.resume();
    callback(error);
  });
}

/**
 * Starts the fake SMTP server on `host:port` (port 0 picks a free one) and keeps every accepted
 * message in `mailboxDir`. Any user name and password are accepted; STARTTLS is not offered.
 * @returns {Promise<{ port: number, url: string, mailboxDir: string, stop: () => Promise<void> }>}
 */
export async function startFakeSmtp({ port = 2525, host = '127.0.0.1', mailboxDir }) {
  if (!mailboxDir) throw new Error('startFakeSmtp needs a mailboxDir');
  await mkdir(mailboxDir, { recursive: true });
  const server = new SMTPServer({
    name: 'switchback-local-mail',
    banner: 'Switchback local test mail server: messages are kept, never delivered',
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    allowInsecureAuth: true,
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onAuth(auth, _session, callback) {
      callback(null, { user: auth.username || 'local' });
    },
    onData(stream, _session, callback) {
      keepMessage(stream, mailboxDir, callback);
    },
  });
  await new Promise((resolve, reject) => {
    const onError = (error) => {
      reject(
        error.code === 'EADDRINUSE'
          ? new Error(`port ${port} on ${host} is in use; choose another with FAKE_SMTP_PORT, or set SMTP_URL to a real server`)
          : error,
      );
    };
    server.once('error', onError);
    server.listen(port, host, () => {
      server.off('error', onError);
      resolve();
    });
  });
  // Errors on single connections (a client hanging up) must not crash the process.
  server.on('error', () => {});
  const actualPort = server.server.address().port;
  return {
    port: actualPort,
    url: `smtp://${host}:${actualPort}`,
    mailboxDir,
    stop: () => new Promise((resolve) => server.close(() => resolve())),
  };
}

const isMain = process.argv[1] && pathToFileURL(process.argv[1]).href === import.meta.url;
if (isMain) {
  const { values } = parseArgs({
    options: { port: { type: 'string', default: process.env.FAKE_SMTP_PORT || '2525' }, dir: { type: 'string', default: '.data/mailbox' } },
  });
  const started = await startFakeSmtp({ port: Number(values.port), mailboxDir: path.resolve(values.dir) });
  console.log(`Local test mail server on ${started.url}; messages kept in ${started.mailboxDir}`);
  const stop = async () => {
    await started.stop();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
