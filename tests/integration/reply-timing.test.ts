// Whether an address has an account must not show in how fast the reset or sign-up request is
// answered. Checked by structure, not by a clock: while another connection holds the tables the
// account work needs locked, the reply must still arrive, so it cannot depend on that work.
import mariadb from 'mariadb';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { POST as resetRoute } from '@/app/api/password-reset/route';
import { POST as signUpRoute } from '@/app/api/users/route';
import { PasswordResetToken } from '@/db/models';
import { ctx, makeUser, migrateUp, requestAs } from '../support/integration';
import { startTestMailbox, type TestMailbox } from '../support/mail';

let mailbox: TestMailbox;
beforeAll(async () => {
  mailbox = await startTestMailbox();
  await migrateUp();
});
afterAll(() => mailbox.stop());

function connect() {
  return mariadb.createConnection({
    host: process.env.DB_HOST ?? '127.0.0.1',
    port: Number(process.env.DB_PORT),
    user: process.env.DB_USER,
    password: process.env.DB_PASSWORD,
    database: process.env.DB_NAME,
  });
}

/** Holds a lock from a connection of its own until `release()`. */
async function holdLock(take: (c: mariadb.Connection) => Promise<unknown>, release: (c: mariadb.Connection) => Promise<unknown>) {
  const connection = await connect();
  await take(connection);
  let released = false;
  return {
    get released() {
      return released;
    },
    async release() {
      if (released) return;
      released = true;
      await release(connection);
      await connection.end();
    },
  };
}

/** `tables` write-locked: nobody else reads or writes them. */
const lockTables = (tables: string[]) =>
  holdLock(
    (c) => c.query(`LOCK TABLES ${tables.map((t) => `\`${t}\` WRITE`).join(', ')}`),
    (c) => c.query('UNLOCK TABLES'),
  );

/**
 * Every row and gap of a table locked for update in an open transaction: writes to it wait. (A
 * table lock would not do for email_confirmation_tokens: MariaDB then also holds up inserts into
 * users, the table it refers to.)
 */
const lockRows = (table: string) =>
  holdLock(
    async (c) => {
      await c.beginTransaction();
      await c.query(`SELECT id FROM \`${table}\` FOR UPDATE`);
    },
    (c) => c.commit(),
  );

async function reply(response: Promise<Response>) {
  const r = await response;
  return { status: r.status, body: await r.json() };
}

describe('answers that do not wait for account work', () => {
  it('a reset request is answered, the same for a known and an unknown address, while the account tables are locked', async () => {
    const user = await makeUser('timed');
    const lock = await lockTables(['users', 'password_reset_tokens']);
    try {
      const known = await reply(resetRoute(await requestAs(null, 'POST', '/api/password-reset', { json: { email: user.email } }), ctx({})));
      const unknown = await reply(resetRoute(await requestAs(null, 'POST', '/api/password-reset', { json: { email: `nobody-${randomUUID()}@tests.example.org` } }), ctx({})));
      expect(lock.released).toBe(false); // both replies came while the lookup could not have run
      expect(known).toEqual(unknown);
      expect(known.status).toBe(202);
    } finally {
      await lock.release();
    }
    // The work happens after the reply: the link is stored and mailed once the tables are free.
    await mailbox.waitFor((m) => m.to.includes(user.email) && m.text.includes('/reset-password/'));
    expect(await PasswordResetToken.count({ where: { userId: user.id } })).toBe(1);
  });

  it('a sign-up is answered while the confirmation links cannot be written, and the link follows', async () => {
    const email = `timed-${randomUUID().slice(0, 8)}@tests.example.org`;
    const lock = await lockRows('email_confirmation_tokens');
    try {
      const answer = await reply(signUpRoute(await requestAs(null, 'POST', '/api/users', { json: { name: 'Timed Person', email, password: 'long-enough-pass' } }), ctx({})));
      expect(lock.released).toBe(false);
      expect(answer.status).toBe(202);
    } finally {
      await lock.release();
    }
    await mailbox.waitFor((m) => m.to.includes(email) && m.text.includes('/confirm-email/'));
  });
});
