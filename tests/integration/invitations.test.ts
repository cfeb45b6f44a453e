// The whole invitation flow through the real fake SMTP server and the real MariaDB: the message
// arrives, its link works exactly once, and the new member gets the invited role.
import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { GET as listInvitationsRoute, POST as inviteRoute } from '@/app/api/studies/[id]/invitations/route';
import { DELETE as revokeRoute } from '@/app/api/studies/[id]/invitations/[invitationId]/route';
import { POST as resendRoute } from '@/app/api/studies/[id]/invitations/[invitationId]/resend/route';
import { POST as acceptRoute } from '@/app/api/invitations/accept/route';
import { POST as signUpRoute } from '@/app/api/users/route';
import { GET as getStudyRoute } from '@/app/api/studies/[id]/route';
import { POST as confirmRoute } from '@/app/api/email-confirmation/route';
import { AuditEvent, Invitation, Membership, User } from '@/db/models';
import { hashToken } from '@/lib/server/auth/tokens';
import { inspectInvitation } from '@/lib/server/services/invitations';
import { ctx, makeStudyWithTeam, makeUser, migrateUp, requestAs, type TestUser } from '../support/integration';
import { linkIn, mailboxOfFile, tokenOf } from '../support/mail';

const mailbox = mailboxOfFile({ linkBase: 'http://127.0.0.1:3999' });
beforeAll(migrateUp);

const freshAddress = (label: string) => `${label}-${randomUUID().slice(0, 8)}@invitees.example.org`;

async function invite(owner: TestUser, studyId: number, email: string, role: string) {
  const response = await inviteRoute(await requestAs(owner, 'POST', `/api/studies/${studyId}/invitations`, { json: { email, role } }), ctx({ id: String(studyId) }));
  return { status: response.status, body: await response.json() };
}

async function accept(user: TestUser, token: string) {
  const response = await acceptRoute(await requestAs(user, 'POST', '/api/invitations/accept', { json: { token } }), ctx({}));
  return { status: response.status, body: await response.json() };
}

/** Signs up through the route and confirms the address with the mailed link, as a new colleague would. */
async function signUp(email: string): Promise<TestUser> {
  const password = `pw-${randomUUID()}`;
  const response = await signUpRoute(await requestAs(null, 'POST', '/api/users', { json: { name: 'New Colleague', email, password } }), ctx({}));
  expect(response.status).toBe(202);
  const user = (await User.findOne({ where: { email } }))!;
  const confirmation = await mailbox.waitFor((m) => m.to.includes(email) && m.text.includes('/confirm-email/'));
  const token = tokenOf(linkIn(confirmation, '/confirm-email/'));
  expect((await confirmRoute(await requestAs(null, 'POST', '/api/email-confirmation', { json: { token } }), ctx({}))).status).toBe(200);
  return { id: user.id, email: user.email, name: user.name, password };
}

async function invitedToken(email: string) {
  const message = await mailbox.waitFor((m) => m.to.includes(email) && m.text.includes('/invitations/'));
  return { message, link: linkIn(message, '/invitations/'), token: tokenOf(linkIn(message, '/invitations/')) };
}

describe('inviting a new person by e-mail', () => {
  it('delivers a link that lets them sign up, accept once and work with the invited role', async () => {
    const { study, team } = await makeStudyWithTeam('Invitation flow study');
    const email = freshAddress('newcomer');
    const sent = await invite(team.owner, study.id, email, 'editor');
    expect(sent.status).toBe(201);
    expect(sent.body).toMatchObject({ mailSent: true, invitation: { email, role: 'editor', state: 'pending' } });

    const { message, link, token } = await invitedToken(email);
    expect(message.subject).toContain('Invitation flow study');
    expect(message.text).toMatch(/editor/i);
    expect(link.origin).toBe('http://127.0.0.1:3999'); // links use NEXTAUTH_URL as their base

    // Only the hash is stored.
    const row = await Invitation.findByPk(sent.body.invitation.id);
    expect(row!.tokenHash).toBe(hashToken(token));
    expect(row!.tokenHash).not.toContain(token);
    expect(row!.expiresAt.getTime() - row!.createdAt.getTime()).toBeCloseTo(7 * 24 * 3600 * 1000, -4);

    expect(await inspectInvitation(token)).toMatchObject({ state: 'pending', studyId: study.id, role: 'editor', email });
    const newcomer = await signUp(email);
    const accepted = await accept(newcomer, token);
    expect(accepted.status).toBe(200);
    expect(accepted.body).toEqual({ studyId: study.id, role: 'editor', alreadyMember: false });

    const studyReply = await getStudyRoute(await requestAs(newcomer, 'GET', `/api/studies/${study.id}`), ctx({ id: String(study.id) }));
    expect(studyReply.status).toBe(200);
    expect((await studyReply.json()).role).toBe('editor');

    const again = await accept(newcomer, token);
    expect(again.status).toBe(410);
    expect(again.body.error).toMatch(/already been used/);
    expect((await inspectInvitation(token)).state).toBe('accepted');

    const actions = (await AuditEvent.findAll({ where: { studyId: study.id }, order: [['id', 'ASC']] })).map((e) => e.action);
    expect(actions).toEqual(['invitation.create', 'invitation.accept']);
  });

  it('lets an existing user accept after signing in, and refuses a different signed-in account', async () => {
    const { study, team } = await makeStudyWithTeam('Existing user invitation');
    const existing = await makeUser('existing');
    const stranger = await makeUser('stranger');
    await invite(team.owner, study.id, existing.email, 'viewer');
    const { token } = await invitedToken(existing.email);

    const wrong = await accept(stranger, token);
    expect(wrong.status).toBe(403);
    expect(wrong.body.error).toContain(existing.email);
    expect(await Membership.count({ where: { studyId: study.id, userId: stranger.id } })).toBe(0);

    const anonymous = await acceptRoute(await requestAs(null, 'POST', '/api/invitations/accept', { json: { token } }), ctx({}));
    expect(anonymous.status).toBe(401);

    expect((await accept(existing, token)).body).toMatchObject({ role: 'viewer', alreadyMember: false });
    expect((await Membership.findOne({ where: { studyId: study.id, userId: existing.id } }))!.role).toBe('viewer');
  });

  it('accepts a link only once even when two clicks race', async () => {
    const { study, team } = await makeStudyWithTeam('Racing accept');
    const email = freshAddress('racer');
    await invite(team.owner, study.id, email, 'operator');
    const { token } = await invitedToken(email);
    const user = await signUp(email);
    const results = await Promise.all([accept(user, token), accept(user, token), accept(user, token)]);
    expect(results.map((r) => r.status).sort()).toEqual([200, 410, 410]);
    expect(await Membership.count({ where: { studyId: study.id, userId: user.id } })).toBe(1);
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'invitation.accept' } })).toBe(1);
  });
});

describe('links that no longer work give a clear answer', () => {
  it('refuses an expired link', async () => {
    const { study, team } = await makeStudyWithTeam('Expired link');
    const email = freshAddress('late');
    const sent = await invite(team.owner, study.id, email, 'viewer');
    const { token } = await invitedToken(email);
    await Invitation.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { id: sent.body.invitation.id } });
    const user = await signUp(email);
    const reply = await accept(user, token);
    expect(reply.status).toBe(410);
    expect(reply.body.error).toMatch(/expired/);
    expect((await inspectInvitation(token)).state).toBe('expired');
    expect(await Membership.count({ where: { studyId: study.id, userId: user.id } })).toBe(0);
  });

  it('refuses a withdrawn link and lists it no more', async () => {
    const { study, team } = await makeStudyWithTeam('Revoked link');
    const email = freshAddress('withdrawn');
    const sent = await invite(team.owner, study.id, email, 'editor');
    const { token } = await invitedToken(email);
    const params = { id: String(study.id), invitationId: String(sent.body.invitation.id) };
    const revoked = await revokeRoute(await requestAs(team.owner, 'DELETE', `/api/studies/${study.id}/invitations/${params.invitationId}`), ctx(params));
    expect(revoked.status).toBe(204);
    const user = await signUp(email);
    const reply = await accept(user, token);
    expect(reply.status).toBe(410);
    expect(reply.body.error).toMatch(/withdrawn/);
    const listed = await listInvitationsRoute(await requestAs(team.owner, 'GET', `/api/studies/${study.id}/invitations`), ctx({ id: String(study.id) }));
    expect((await listed.json()).invitations).toEqual([]);
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'invitation.revoke' } })).toBe(1);
  });

  it('refuses an unknown or malformed token', async () => {
    const user = await makeUser('guesser');
    expect((await accept(user, 'A'.repeat(43))).status).toBe(410);
    expect((await accept(user, 'short')).status).toBe(422);
    expect((await inspectInvitation('../../etc/passwd')).state).toBe('unknown');
  });

  it('resending replaces the link: the old one stops working, the new one works', async () => {
    const { study, team } = await makeStudyWithTeam('Resent link');
    const email = freshAddress('resent');
    const sent = await invite(team.owner, study.id, email, 'operator');
    const first = await invitedToken(email);
    const params = { id: String(study.id), invitationId: String(sent.body.invitation.id) };
    const resent = await resendRoute(await requestAs(team.owner, 'POST', `/api/studies/${study.id}/invitations/${params.invitationId}/resend`), ctx(params));
    expect(resent.status).toBe(200);
    const messages = await (async () => {
      for (let i = 0; i < 200; i++) {
        const found = (await mailbox.all()).filter((m) => m.to.includes(email));
        if (found.length >= 2) return found;
        await new Promise((r) => setTimeout(r, 50));
      }
      throw new Error('the resent message did not arrive');
    })();
    const second = tokenOf(linkIn(messages[0], '/invitations/'));
    expect(second).not.toBe(first.token);
    const user = await signUp(email);
    expect((await accept(user, first.token)).status).toBe(410);
    expect((await accept(user, second)).status).toBe(200);
  });
});

describe('who can invite whom', () => {
  it('refuses duplicates and current members with 409', async () => {
    const { study, team } = await makeStudyWithTeam('Duplicate invitations');
    const email = freshAddress('twice');
    expect((await invite(team.owner, study.id, email, 'viewer')).status).toBe(201);
    const twice = await invite(team.owner, study.id, email, 'editor');
    expect(twice.status).toBe(409);
    expect(twice.body.error).toMatch(/pending invitation/);
    const member = await invite(team.owner, study.id, team.viewer.email, 'editor');
    expect(member.status).toBe(409);
    expect(member.body.error).toMatch(/already a member/);
  });

  it('lets only owners invite, and names bad fields', async () => {
    const { study, team } = await makeStudyWithTeam('Only owners invite');
    expect((await invite(team.editor, study.id, freshAddress('nope'), 'viewer')).status).toBe(403);
    const bad = await invite(team.owner, study.id, 'not-an-address', 'chief');
    expect(bad.status).toBe(422);
    expect(bad.body.issues.map((i: { path: string }) => i.path).sort()).toEqual(['email', 'role']);
    expect(await Invitation.count({ where: { studyId: study.id } })).toBe(0);
  });

  it('keeps the invitation and says so when the mail server is unreachable', async () => {
    const { study, team } = await makeStudyWithTeam('Mail server down');
    const saved = process.env.SMTP_URL;
    process.env.SMTP_URL = 'smtp://127.0.0.1:1'; // nothing listens on port 1
    try {
      const sent = await invite(team.owner, study.id, freshAddress('offline'), 'viewer');
      expect(sent.status).toBe(201);
      expect(sent.body.mailSent).toBe(false);
      expect(await Invitation.count({ where: { studyId: study.id } })).toBe(1);
    } finally {
      process.env.SMTP_URL = saved;
    }
  });

  it('does not change an existing member\u2019s role when they accept an invitation', async () => {
    const { study, team } = await makeStudyWithTeam('Already a member');
    const email = freshAddress('joined-twice');
    await invite(team.owner, study.id, email, 'editor');
    const { token } = await invitedToken(email);
    const user = await signUp(email);
    await Membership.create({ studyId: study.id, userId: user.id, role: 'viewer' });
    expect((await accept(user, token)).body).toMatchObject({ role: 'viewer', alreadyMember: true });
    expect((await Membership.findOne({ where: { studyId: study.id, userId: user.id } }))!.role).toBe('viewer');
  });
});

describe('the demo data', () => {
  it('seeds one open invitation in the demo study, once', async () => {
    const { db } = await import('@/db');
    const { seed: seedTeam } = await import('@/db/seeders/01-demo-team');
    const { seed: seedExtras, DEMO_PENDING_INVITEE } = await import('@/db/seeders/05-demo-team-extras');
    await seedTeam(db());
    await seedExtras(db());
    await seedExtras(db());
    const rows = await Invitation.findAll({ where: { email: DEMO_PENDING_INVITEE } });
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ role: 'viewer', acceptedAt: null, revokedAt: null });
  });
});

describe('inviting the same address twice at once', () => {
  it('creates one invitation and answers the others with 409, never a server error', async () => {
    const { study, team } = await makeStudyWithTeam('Parallel invitations study');
    const email = freshAddress('twice');
    const results = await Promise.all(Array.from({ length: 6 }, () => invite(team.owner, study.id, email, 'viewer')));
    expect(results.map((r) => r.status).sort()).toEqual([201, 409, 409, 409, 409, 409]);
    expect(await Invitation.count({ where: { studyId: study.id, email } })).toBe(1);
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'invitation.create' } })).toBe(1);
  });
});

describe('who invited and who accepted', () => {
  it('are kept in their own columns', async () => {
    const { study, team } = await makeStudyWithTeam('Invitation columns study');
    const email = freshAddress('columns');
    const sent = await invite(team.owner, study.id, email, 'operator');
    expect(sent.status).toBe(201);
    const { token } = await invitedToken(email);
    const invitee = await signUp(email);
    expect((await accept(invitee, token)).status).toBe(200);
    const row = await Invitation.findByPk(sent.body.invitation.id);
    expect({ invitedBy: row?.invitedBy, acceptedBy: row?.acceptedBy }).toEqual({ invitedBy: team.owner.id, acceptedBy: invitee.id });
  });
});
