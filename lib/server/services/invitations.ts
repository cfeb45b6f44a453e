import type { Transaction } from 'sequelize';
import { Invitation, Membership, Study, User } from '@/db/models';
import { db } from '@/db';
import { ApiError, ConflictError, ForbiddenError, NotFoundError } from '@/lib/server/errors';
import type { Role } from '@/lib/shared/roles';
import { appLink } from '@/lib/server/mail/links';
import { invitationMessage } from '@/lib/server/mail/templates';
import { sendMail } from '@/lib/server/mail/transport';
import type { InvitationInput } from '@/lib/shared/validations/team';
import { recordAudit } from './audit';
import { hashToken, newToken } from '@/lib/server/auth/tokens';

export const INVITATION_DAYS = 7;
const DAY_MS = 24 * 60 * 60 * 1000;

export type InvitationState = 'pending' | 'accepted' | 'expired' | 'revoked' | 'unknown';

/** What an invitation link leads to; the page shows a clear message for every state. */
export type InvitationView = { state: InvitationState; studyId?: number; studyName?: string; email?: string; role?: Role; expiresAt?: string };

/** A link that was valid once but can no longer be used: 410, with a message for people. */
export class LinkUnusableError extends ApiError {
  constructor(readonly state: InvitationState, message: string) {
    super(410, message);
  }
}

const STATE_MESSAGES: Record<Exclude<InvitationState, 'pending'>, string> = {
  accepted: 'This invitation has already been used. Sign in to open the study.',
  expired: 'This invitation has expired. Ask the study owner to send a new one.',
  revoked: 'This invitation was withdrawn by the study owner.',
  unknown: 'This invitation link is not valid. Check that you copied the whole address, or ask for a new one.',
};

function stateOf(invitation: Invitation | null, now = new Date()): InvitationState {
  if (!invitation) return 'unknown';
  if (invitation.acceptedAt) return 'accepted';
  if (invitation.revokedAt) return 'revoked';
  if (invitation.expiresAt.getTime() <= now.getTime()) return 'expired';
  return 'pending';
}

function invitationJson(invitation: Invitation) {
  const inviter = (invitation as unknown as { inviter?: User | null }).inviter;
  return {
    id: invitation.id,
    email: invitation.email,
    role: invitation.role,
    state: stateOf(invitation) as 'pending' | 'expired',
    invitedBy: inviter ? inviter.name : null,
    createdAt: invitation.createdAt.toISOString(),
    expiresAt: invitation.expiresAt.toISOString(),
  };
}
export type InvitationDto = ReturnType<typeof invitationJson>;

/** Open invitations of a study (pending or expired, not accepted or revoked), newest first. */
export async function listInvitations(studyId: number): Promise<InvitationDto[]> {
  db();
  const rows = await Invitation.findAll({
    where: { studyId, acceptedAt: null, revokedAt: null },
    include: [{ model: User, as: 'inviter', attributes: ['name'] }],
    order: [['createdAt', 'DESC'], ['id', 'DESC']],
  });
  return rows.map(invitationJson);
}

/** Sends the invitation mail; false (and a log line) when the mail server refused or is missing. */
async function deliver(invitation: Invitation, token: string, studyName: string, inviterName: string): Promise<boolean> {
  try {
    const link = appLink(`/invitations/${token}`);
    await sendMail(invitationMessage({ to: invitation.email, studyName, inviterName, role: invitation.role, link, expiresAt: invitation.expiresAt }));
    return true;
  } catch (error) {
    console.error('[switchback] could not send an invitation:', error instanceof Error ? error.message : error);
    return false;
  }
}

async function lockOpenInvitation(studyId: number, invitationId: number, transaction: Transaction) {
  const invitation = await Invitation.findOne({ where: { id: invitationId, studyId, acceptedAt: null, revokedAt: null }, transaction, lock: transaction.LOCK.UPDATE });
  if (!invitation) throw new NotFoundError('No open invitation with this id in this study.');
  return invitation;
}

/**
 * Invites an address with a role. The invitation and its audit event are one transaction; the mail
 * goes out after the commit, and `mailSent: false` tells the owner to resend if the server refused.
 * @throws ConflictError when the address already belongs to a member or has a pending invitation.
 */
export async function createInvitation(actor: { id: number; name: string }, study: Study, input: InvitationInput) {
  const { token, hash } = newToken();
  const invitation = await db().transaction(async (transaction) => {
    // Invitations of one study are created one at a time: two owners inviting the same address at
    // once would otherwise both take a gap lock on the empty range and deadlock on the insert.
    await Study.findByPk(study.id, { attributes: ['id'], transaction, lock: transaction.LOCK.UPDATE });
    const member = await Membership.findOne({
      where: { studyId: study.id },
      include: [{ model: User, as: 'user', where: { email: input.email }, attributes: ['id'] }],
      transaction,
    });
    if (member) throw new ConflictError(`${input.email} is already a member of this study. Change their role in the member list instead.`);
    const open = await Invitation.findAll({ where: { studyId: study.id, email: input.email, acceptedAt: null, revokedAt: null }, transaction, lock: transaction.LOCK.UPDATE });
    if (open.some((i) => stateOf(i) === 'pending')) {
      throw new ConflictError(`${input.email} already has a pending invitation. Resend or withdraw it instead.`);
    }
    // Expired leftovers for the same address are withdrawn so the list shows one entry per person.
    for (const old of open) await old.update({ revokedAt: new Date() }, { transaction });
    const created = await Invitation.create(
      { studyId: study.id, email: input.email, role: input.role, tokenHash: hash, invitedBy: actor.id, expiresAt: new Date(Date.now() + INVITATION_DAYS * DAY_MS), acceptedAt: null, acceptedBy: null, revokedAt: null },
      { transaction },
    );
    await recordAudit({ actorId: actor.id, studyId: study.id, action: 'invitation.create', details: { invitationId: created.id, email: input.email, role: input.role } }, transaction);
    return created;
  });
  const mailSent = await deliver(invitation, token, study.name, actor.name || 'A colleague');
  return { invitation: invitationJson(invitation), mailSent };
}

/** A fresh link (the old one stops working) and a fresh 7-day expiry, sent again. */
export async function resendInvitation(actor: { id: number; name: string }, study: Study, invitationId: number) {
  const { token, hash } = newToken();
  const invitation = await db().transaction(async (transaction) => {
    const open = await lockOpenInvitation(study.id, invitationId, transaction);
    await open.update({ tokenHash: hash, expiresAt: new Date(Date.now() + INVITATION_DAYS * DAY_MS) }, { transaction });
    await recordAudit({ actorId: actor.id, studyId: study.id, action: 'invitation.resend', details: { invitationId, email: open.email, role: open.role } }, transaction);
    return open;
  });
  const mailSent = await deliver(invitation, token, study.name, actor.name || 'A colleague');
  return { invitation: invitationJson(invitation), mailSent };
}

/** Withdraws an open invitation; its link then shows "withdrawn". */
export async function revokeInvitation(actorId: number, studyId: number, invitationId: number): Promise<void> {
  await db().transaction(async (transaction) => {
    const open = await lockOpenInvitation(studyId, invitationId, transaction);
    await open.update({ revokedAt: new Date() }, { transaction });
    await recordAudit({ actorId, studyId, action: 'invitation.revoke', details: { invitationId, email: open.email, role: open.role } }, transaction);
  });
}

/** What a link's token leads to, for the invitation page (no side effects). */
export async function inspectInvitation(token: string): Promise<InvitationView> {
  db();
  const invitation = /^[A-Za-z0-9_-]{43}$/.test(token)
    ? await Invitation.findOne({ where: { tokenHash: hashToken(token) }, include: [{ model: Study, as: 'study', attributes: ['id', 'name'] }] })
    : null;
  const state = stateOf(invitation);
  if (!invitation) return { state };
  const study = (invitation as unknown as { study?: Study | null }).study;
  if (!study) return { state: 'unknown' };
  return { state, studyId: study.id, studyName: study.name, email: invitation.email, role: invitation.role, expiresAt: invitation.expiresAt.toISOString() };
}

/** What an invitation link shows, for the invitation page: details when pending, else why not. */
export type InvitationLinkView =
  | { state: 'pending'; studyName: string; email: string; role: Role; expiresAt: string }
  | { state: Exclude<InvitationState, 'pending'>; message: string };

/** Describes a link's token for the invitation page (no side effects). */
export async function describeInvitationLink(token: string): Promise<InvitationLinkView> {
  const view = await inspectInvitation(token);
  if (view.state === 'pending') return { state: 'pending', studyName: view.studyName!, email: view.email!, role: view.role!, expiresAt: view.expiresAt! };
  return { state: view.state, message: STATE_MESSAGES[view.state] };
}

/**
 * Accepts an invitation for the signed-in user, once. The row is locked, so two clicks racing each
 * other cannot both succeed. Someone already in the study keeps their role.
 * @throws LinkUnusableError (410) for used, expired, withdrawn or unknown links; ForbiddenError when
 * the user's address is not the invited one, or is not confirmed yet.
 */
export async function acceptInvitation(user: { id: number }, token: string) {
  return db().transaction(async (transaction) => {
    const invitation = await Invitation.findOne({ where: { tokenHash: hashToken(token) }, transaction, lock: transaction.LOCK.UPDATE });
    const state = stateOf(invitation);
    if (!invitation || state !== 'pending') throw new LinkUnusableError(state, STATE_MESSAGES[state as Exclude<InvitationState, 'pending'>]);
    const account = await User.findByPk(user.id, { transaction });
    if (!account) throw new NotFoundError('Your account no longer exists.');
    if (account.email.toLowerCase() !== invitation.email.toLowerCase()) {
      throw new ForbiddenError(`This invitation was sent to ${invitation.email}, but you are signed in as ${account.email}. Sign out and sign in (or create an account) with the invited address.`);
    }
    // The address matching proves nothing until its owner has shown they receive its mail.
    if (!account.emailVerifiedAt) {
      throw new ForbiddenError(`Confirm that ${account.email} is yours first: open the link in the confirmation message we sent to it (or ask for a new one under Account), then accept.`);
    }
    const existing = await Membership.findOne({ where: { studyId: invitation.studyId, userId: user.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (!existing) await Membership.create({ studyId: invitation.studyId, userId: user.id, role: invitation.role }, { transaction });
    await invitation.update({ acceptedAt: new Date(), acceptedBy: user.id }, { transaction });
    await recordAudit(
      { actorId: user.id, studyId: invitation.studyId, action: 'invitation.accept', details: { invitationId: invitation.id, email: invitation.email, role: existing ? existing.role : invitation.role, alreadyMember: Boolean(existing) } },
      transaction,
    );
    return { studyId: invitation.studyId, role: existing ? existing.role : invitation.role, alreadyMember: Boolean(existing) };
  });
}
