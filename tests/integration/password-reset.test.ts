// Password reset by e-mail through the real fake SMTP server: the same answer for known and unknown
// addresses, a hashed single-use token that expires, and the new password working at sign-in.
import { beforeAll, describe, expect, it } from 'vitest';
import { POST as requestRoute } from '@/app/api/password-reset/route';
import { POST as completeRoute } from '@/app/api/password-reset/complete/route';
import { GET as listStudiesRoute } from '@/app/api/studies/route';
import { AuditEvent, PasswordResetToken } from '@/db/models';
import { verifyCredentials } from '@/lib/server/auth/credentials';
import { hashToken } from '@/lib/server/auth/tokens';
import { inspectResetToken } from '@/lib/server/services/password-reset';
import { ctx, makeUser, migrateUp, requestAs } from '../support/integration';
import { linkIn, mailboxOfFile, tokenOf } from '../support/mail';

const mailbox = mailboxOfFile({ linkBase: 'http://127.0.0.1:3998' });
beforeAll(migrateUp);

async function ask(email: string) {
  const response = await requestRoute(await requestAs(null, 'POST', '/api/password-reset', { json: { email } }), ctx({}));
  return { status: response.status, body: await response.json() };
}

async function complete(token: string, password: string) {
  const response = await completeRoute(await requestAs(null, 'POST', '/api/password-reset/complete', { json: { token, password } }), ctx({}));
  return { status: response.status, body: await response.json() };
}

async function resetToken(email: string) {
  const message = await mailbox.waitFor((m) => m.to.includes(email));
  const link = linkIn(message, '/reset-password/');
  expect(link.origin).toBe('http://127.0.0.1:3998');
  return tokenOf(link);
}

describe('asking for a reset link', () => {
  it('answers an unknown address exactly as a known one, and mails only the known one', async () => {
    const user = await makeUser('forgetful');
    const unknown = `nobody-${user.id}@tests.example.org`;
    const forUnknown = await ask(unknown);
    const forKnown = await ask(user.email.toUpperCase()); // addresses are compared case-insensitively
    expect(forUnknown).toEqual(forKnown);
    expect(forKnown.status).toBe(202);

    const token = await resetToken(user.email);
    expect((await mailbox.all()).filter((m) => m.to.includes(unknown))).toEqual([]);
    const rows = await PasswordResetToken.findAll({ where: { userId: user.id } });
    expect(rows).toHaveLength(1);
    expect(rows[0].tokenHash).toBe(hashToken(token)); // only the hash is stored
    expect(rows[0].expiresAt.getTime() - Date.now()).toBeLessThanOrEqual(60 * 60_000);
  });

  it('names a malformed address', async () => {
    const reply = await ask('not an address');
    expect(reply.status).toBe(422);
    expect(reply.body.issues[0].path).toBe('email');
  });
});

describe('choosing a new password', () => {
  it('works once with the link, and the new password signs in', async () => {
    const user = await makeUser('resetter');
    await ask(user.email);
    const token = await resetToken(user.email);
    expect(await inspectResetToken(token)).toBe('valid');

    const done = await complete(token, 'a-brand-new-passphrase');
    expect(done.status).toBe(200);
    expect(await verifyCredentials(user.email, 'a-brand-new-passphrase', 'reset-test')).toMatchObject({ id: String(user.id) });
    expect(await verifyCredentials(user.email, user.password, 'reset-test')).toBeNull();
    expect(await AuditEvent.count({ where: { actorId: user.id, action: 'account.password-reset' } })).toBe(1);

    const again = await complete(token, 'yet-another-passphrase');
    expect(again.status).toBe(410);
    expect(again.body.error).toMatch(/already been used/);
    expect(await inspectResetToken(token)).toBe('used');
  });

  it('ends the sessions that were signed in before the reset', async () => {
    const user = await makeUser('stolen-session');
    const studies = async (sessionEpoch: number) => (await listStudiesRoute(await requestAs({ ...user, sessionEpoch }, 'GET', '/api/studies'), ctx({}))).status;
    expect(await studies(0)).toBe(200);
    await ask(user.email);
    expect((await complete(await resetToken(user.email), 'a-passphrase-after-theft')).status).toBe(200);
    expect(await studies(0)).toBe(401); // the old session, wherever it lives
    const signedIn = await verifyCredentials(user.email, 'a-passphrase-after-theft', 'reset-test');
    expect(signedIn).toMatchObject({ sessionEpoch: 1 });
    expect(await studies(1)).toBe(200); // a sign-in after the reset carries the new epoch
  });

  it('refuses an expired link and leaves the password alone', async () => {
    const user = await makeUser('too-late');
    await ask(user.email);
    const token = await resetToken(user.email);
    await PasswordResetToken.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { tokenHash: hashToken(token) } });
    const reply = await complete(token, 'a-brand-new-passphrase');
    expect(reply.status).toBe(410);
    expect(reply.body.error).toMatch(/expired/);
    expect(await verifyCredentials(user.email, user.password, 'reset-test-2')).not.toBeNull();
  });

  it('refuses unknown tokens and short passwords', async () => {
    expect((await complete('B'.repeat(43), 'long-enough-passphrase')).status).toBe(410);
    const short = await complete('B'.repeat(43), 'short');
    expect(short.status).toBe(422);
    expect(short.body.issues[0].path).toBe('password');
    expect(await inspectResetToken('nonsense')).toBe('unknown');
  });

  it('makes an older link useless once a newer one was used', async () => {
    const user = await makeUser('two-links');
    await ask(user.email);
    const first = await resetToken(user.email);
    await ask(user.email);
    const second = await (async () => {
      for (let i = 0; i < 200; i++) {
        const tokens = (await mailbox.all()).filter((m) => m.to.includes(user.email)).map((m) => tokenOf(linkIn(m, '/reset-password/')));
        const fresh = tokens.find((t) => t !== first);
        if (fresh) return fresh;
        await new Promise((r) => setTimeout(r, 50));
      }
      throw new Error('the second message did not arrive');
    })();
    expect((await complete(second, 'the-second-passphrase')).status).toBe(200);
    expect((await complete(first, 'the-first-passphrase')).status).toBe(410);
  });
});

describe('flooding', () => {
  it('sends at most three messages per address in 15 minutes, with the same answer throughout', async () => {
    const user = await makeUser('flooded');
    const answers = [];
    for (let i = 0; i < 5; i++) answers.push(await ask(user.email));
    expect(new Set(answers.map((a) => JSON.stringify(a))).size).toBe(1);
    // The links are stored and mailed after the replies; wait for the three, then check no fourth.
    await mailbox.waitFor(() => true);
    for (let i = 0; i < 200 && (await mailbox.all()).filter((m) => m.to.includes(user.email)).length < 3; i++) await new Promise((r) => setTimeout(r, 50));
    expect(await PasswordResetToken.count({ where: { userId: user.id } })).toBe(3);
    expect((await mailbox.all()).filter((m) => m.to.includes(user.email))).toHaveLength(3);
  });
});
