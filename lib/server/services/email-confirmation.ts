import { Op, type Transaction } from 'sequelize';
import { EmailConfirmationToken, User } from '@/db/models';
import { db } from '@/db';
import { ApiError, ConflictError } from '@/lib/server/errors';
import { FailureLimiter } from '@/lib/server/auth/rate-limit';
import { appLink } from '@/lib/server/mail/links';
import { addressConfirmationMessage } from '@/lib/server/mail/templates';
import { queueMail } from '@/lib/server/mail/transport';
import { recordAudit } from '@/lib/server/services/audit';
import { hashToken, newToken } from '@/lib/server/auth/tokens';

export const CONFIRMATION_HOURS = 48;

export type ConfirmationState = 'valid' | 'used' | 'expired' | 'unknown';

const STATE_MESSAGES: Record<Exclude<ConfirmationState, 'valid'>, string> = {
  used: 'This confirmation link has already been used. Sign in: if your address still shows as unconfirmed, ask for a new link under Account.',
  expired: `This confirmation link has expired (links work for ${CONFIRMATION_HOURS} hours). Sign in and ask for a new one under Account.`,
  unknown: 'This confirmation link is not valid. Check that you copied the whole address, or ask for a new one under Account.',
};

// At most 3 links per account in 15 minutes, so "send again" cannot flood an inbox.
const resendLimiter = new FailureLimiter({ limit: 3, windowMs: 15 * 60_000 });

function stateOf(row: EmailConfirmationToken | null, now = new Date()): ConfirmationState {
  if (!row) return 'unknown';
  if (row.usedAt) return 'used';
  if (row.expiresAt.getTime() <= now.getTime()) return 'expired';
  return 'valid';
}

/**
 * Stores a new hashed confirmation token for the user (earlier open ones stop working) and mails
 * the link. Returns the delivery promise (true when the mail server took it); never throws for mail.
 */
export async function sendAddressConfirmation(user: { id: number; email: string }, transaction?: Transaction): Promise<{ delivery: Promise<boolean> }> {
  db();
  const { token, hash } = newToken();
  const expiresAt = new Date(Date.now() + CONFIRMATION_HOURS * 3_600_000);
  await EmailConfirmationToken.update({ usedAt: new Date() }, { where: { userId: user.id, usedAt: { [Op.is]: null } }, transaction });
  await EmailConfirmationToken.create({ userId: user.id, tokenHash: hash, expiresAt, usedAt: null }, { transaction });
  const message = addressConfirmationMessage({ to: user.email, link: appLink(`/confirm-email/${token}`), expiresAt });
  return { delivery: queueMail(message, 'an address confirmation') };
}

/**
 * A new confirmation link for a signed-in user who lost or let the last one expire.
 * @throws ConflictError when the address is already confirmed; ApiError 429 after 3 in 15 minutes.
 */
export async function resendAddressConfirmation(user: { id: number; email: string }): Promise<{ delivery: Promise<boolean> }> {
  db();
  const account = await User.findByPk(user.id, { attributes: ['id', 'email', 'emailVerifiedAt'] });
  if (!account) throw new ApiError(401, 'Sign in to continue.');
  if (account.emailVerifiedAt) throw new ConflictError(`${account.email} is already confirmed.`);
  if (!resendLimiter.tryAttempt(String(account.id))) throw new ApiError(429, 'Three links were sent in the last 15 minutes. Use the newest one, or wait and ask again.');
  return sendAddressConfirmation({ id: account.id, email: account.email });
}

/** Whether a confirmation link can be used, with the reason when not (for its page; no side effects). */
export async function describeConfirmationLink(token: string): Promise<{ state: ConfirmationState; message: string | null }> {
  if (!/^[A-Za-z0-9_-]{43}$/.test(token)) return { state: 'unknown', message: STATE_MESSAGES.unknown };
  db();
  const state = stateOf(await EmailConfirmationToken.findOne({ where: { tokenHash: hashToken(token) } }));
  return { state, message: state === 'valid' ? null : STATE_MESSAGES[state] };
}

/**
 * Confirms the address of the token's account, once: the token row is locked and spent together
 * with the user's other open links, the account is marked confirmed, and the event is audited,
 * all in one transaction.
 * @throws ApiError 410 for used, expired or unknown tokens.
 */
export async function confirmAddress(token: string): Promise<{ email: string }> {
  return db().transaction(async (transaction) => {
    const row = await EmailConfirmationToken.findOne({ where: { tokenHash: hashToken(token) }, transaction, lock: transaction.LOCK.UPDATE });
    const state = stateOf(row);
    if (!row || state !== 'valid') throw new ApiError(410, STATE_MESSAGES[state as Exclude<ConfirmationState, 'valid'>]);
    const user = await User.findByPk(row.userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw new ApiError(410, STATE_MESSAGES.unknown);
    if (!user.emailVerifiedAt) await user.update({ emailVerifiedAt: new Date() }, { transaction });
    await EmailConfirmationToken.update({ usedAt: new Date() }, { where: { userId: user.id, usedAt: { [Op.is]: null } }, transaction });
    await recordAudit({ actorId: user.id, studyId: null, action: 'account.email-confirmed', details: { email: user.email } }, transaction);
    return { email: user.email };
  });
}
