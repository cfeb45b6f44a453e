// Account takeover through mail, closed: the mailbox shows each person only their own mail, an
// invitation is accepted by address only once the address is confirmed by a mailed single-use link,
// and sign-up answers the same for a known and an unknown address.
import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { POST as confirmRoute } from '@/app/api/email-confirmation/route';
import { POST as resendRoute } from '@/app/api/email-confirmation/resend/route';
import { POST as acceptRoute } from '@/app/api/invitations/accept/route';
import { GET as mailboxRoute } from '@/app/api/mailbox/route';
import { POST as resetRoute } from '@/app/api/password-reset/route';
import { POST as inviteRoute } from '@/app/api/studies/[id]/invitations/route';
import { POST as signUpRoute } from '@/app/api/users/route';
import { AuditEvent, EmailConfirmationToken, User } from '@/db/models';
import { verifyCredentials } from '@/lib/server/auth/credentials';
import { PEER_HEADER, setPeerHeaderStamped } from '@/lib/server/auth/client-address';
import { hashToken } from '@/lib/server/auth/tokens';
import { ctx, makeStudyWithTeam, makeUser, migrateUp, requestAs, type TestUser } from '../support/integration';
import { linkIn, mailboxOfFile, tokenOf } from '../support/mail';

const mailbox = mailboxOfFile({ linkBase: 'http://127.0.0.1:3997' });
beforeAll(migrateUp);

const fresh = (label: string) => `${label}-${randomUUID().slice(0, 8)}@accounts.example.org`;

async function signUp(email: string, password = `pw-${randomUUID()}`, name = 'Morgan Vale') {
  const response = await signUpRoute(await requestAs(null, 'POST', '/api/users', { json: { name, email, password } }), ctx({}));
  return { status: response.status, body: await response.json(), password };
}

async function mailboxOf(user: TestUser) {
  const response = await mailboxRoute(await requestAs(user, 'GET', '/api/mailbox'), ctx({}));
  expect(response.status).toBe(200);
  return (await response.json()) as { enabled: boolean; messages: Array<{ to: string; subject: string; text: string }> };
}

async function confirm(token: string) {
  const response = await confirmRoute(await requestAs(null, 'POST', '/api/email-confirmation', { json: { token } }), ctx({}));
  return { status: response.status, body: await response.json() };
}

async function accept(user: TestUser, token: string) {
  const response = await acceptRoute(await requestAs(user, 'POST', '/api/invitations/accept', { json: { token } }), ctx({}));
  return { status: response.status, body: await response.json() };
}

const confirmationFor = (email: string) => mailbox.waitFor((m) => m.to.includes(email) && m.text.includes('/confirm-email/'));

describe('the local mailbox', () => {
  it('shows a signed-in user only the mail addressed to them, never another person’s reset link', async () => {
    const reader = await makeUser('reader');
    const victim = await makeUser('victim');
    await resetRoute(await requestAs(null, 'POST', '/api/password-reset', { json: { email: victim.email } }), ctx({}));
    await resetRoute(await requestAs(null, 'POST', '/api/password-reset', { json: { email: reader.email } }), ctx({}));
    await mailbox.waitFor((m) => m.to.includes(victim.email));
    await mailbox.waitFor((m) => m.to.includes(reader.email));

    const seen = await mailboxOf(reader);
    expect(seen.enabled).toBe(true);
    expect(seen.messages.length).toBeGreaterThan(0);
    expect(seen.messages.every((m) => m.to.includes(reader.email))).toBe(true);
    expect(JSON.stringify(seen)).not.toContain(victim.email);
    expect((await mailboxOf(victim)).messages.map((m) => m.to)).toEqual([victim.email]);
  });
});

describe('confirming an address', () => {
  it('is needed before an invitation can be accepted by address, and works once with the mailed link', async () => {
    const { study, team } = await makeStudyWithTeam('Confirmation study');
    const email = fresh('invitee');
    expect((await inviteRoute(await requestAs(team.owner, 'POST', `/api/studies/${study.id}/invitations`, { json: { email, role: 'viewer' } }), ctx({ id: String(study.id) }))).status).toBe(201);
    const invitationToken = tokenOf(linkIn(await mailbox.waitFor((m) => m.to.includes(email) && m.text.includes('/invitations/')), '/invitations/'));

    const signed = await signUp(email);
    expect(signed.status).toBe(202);
    const account = (await User.findOne({ where: { email } }))!;
    expect(account.emailVerifiedAt).toBeNull();
    const newcomer = { id: account.id, email, name: account.name, password: signed.password };

    const early = await accept(newcomer, invitationToken);
    expect(early.status).toBe(403);
    expect(early.body.error).toMatch(/^Confirm that .* is yours first/);

    const token = tokenOf(linkIn(await confirmationFor(email), '/confirm-email/'));
    const rows = await EmailConfirmationToken.findAll({ where: { userId: account.id } });
    expect(rows).toHaveLength(1);
    expect(rows[0].tokenHash).toBe(hashToken(token)); // only the hash is stored
    expect(rows[0].expiresAt.getTime() - Date.now()).toBeLessThanOrEqual(48 * 3_600_000);

    const done = await confirm(token);
    expect(done).toEqual({ status: 200, body: { message: `${email} is confirmed.` } });
    expect((await User.findByPk(account.id))?.emailVerifiedAt).not.toBeNull();
    expect(await AuditEvent.count({ where: { actorId: account.id, action: 'account.email-confirmed' } })).toBe(1);
    expect((await confirm(token)).status).toBe(410); // single use

    expect((await accept(newcomer, invitationToken)).status).toBe(200);
  });

  it('refuses an expired or unknown link, and a new link makes the older one useless', async () => {
    const email = fresh('slow');
    await signUp(email);
    const first = tokenOf(linkIn(await confirmationFor(email), '/confirm-email/'));
    const account = (await User.findOne({ where: { email } }))!;
    const user = { id: account.id, email, name: account.name, password: '' };

    const resent = await resendRoute(await requestAs(user, 'POST', '/api/email-confirmation/resend'), ctx({}));
    expect(resent.status).toBe(202);
    const second = await (async () => {
      for (let i = 0; i < 200; i++) {
        const tokens = (await mailbox.all()).filter((m) => m.to.includes(email)).map((m) => tokenOf(linkIn(m, '/confirm-email/')));
        const found = tokens.find((t) => t !== first);
        if (found) return found;
        await new Promise((r) => setTimeout(r, 50));
      }
      throw new Error('the second link did not arrive');
    })();
    expect((await confirm(first)).status).toBe(410);
    await EmailConfirmationToken.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { tokenHash: hashToken(second) } });
    const expired = await confirm(second);
    expect(expired.status).toBe(410);
    expect(expired.body.error).toMatch(/expired/);
    expect((await confirm('C'.repeat(43))).status).toBe(410);
    expect((await confirm('short')).status).toBe(422);
    expect((await User.findByPk(account.id))?.emailVerifiedAt).toBeNull();
  });

  it('answers a resend for a confirmed address with 409', async () => {
    const user = await makeUser('already');
    const reply = await resendRoute(await requestAs(user, 'POST', '/api/email-confirmation/resend'), ctx({}));
    expect(reply.status).toBe(409);
  });
});

describe('signing up', () => {
  it('answers a known address exactly as an unknown one, creates nothing for it and tells its owner', async () => {
    const owner = await makeUser('owner-of-address');
    const newcomer = fresh('newcomer');
    const forUnknown = await signUp(newcomer);
    const forKnown = await signUp(owner.email, 'an-attacker-password');
    expect(forKnown.status).toBe(202);
    expect({ status: forKnown.status, body: forKnown.body }).toEqual({ status: forUnknown.status, body: forUnknown.body });

    expect(await User.count({ where: { email: owner.email } })).toBe(1);
    expect(await verifyCredentials(owner.email, 'an-attacker-password', 'sign-up-test')).toBeNull();
    expect(await verifyCredentials(owner.email, owner.password, 'sign-up-test')).not.toBeNull();
    const notice = await mailbox.waitFor((m) => m.to.includes(owner.email) && m.subject.startsWith('Someone tried to create'));
    expect(notice.text).not.toContain('/confirm-email/');
    await confirmationFor(newcomer);
  });

  it('throttles sign-ups for one address: the fourth within an hour is refused with 429', async () => {
    const email = fresh('hammered');
    const statuses = [];
    for (let i = 0; i < 4; i++) statuses.push((await signUp(email)).status);
    expect(statuses).toEqual([202, 202, 202, 429]);
  });

  it('throttles sign-ups from one client address: after 50 within an hour, the next is refused with 429', async () => {
    setPeerHeaderStamped(true); // as scripts/serve.mjs does: the peer header is the socket's
    try {
      const from = async (peer: string) =>
        (
          await signUpRoute(
            await requestAs(null, 'POST', '/api/users', { json: { name: 'Bulk Person', email: fresh('bulk'), password: 'long-enough-pass' }, headers: { [PEER_HEADER]: peer, 'x-forwarded-for': fresh('ip') } }),
            ctx({}),
          )
        ).status;
      for (let i = 0; i < 50; i++) expect(await from('192.0.2.60')).toBe(202);
      expect(await from('192.0.2.60')).toBe(429);
      expect(await from('192.0.2.61')).toBe(202);
    } finally {
      setPeerHeaderStamped(false);
    }
  });
});
