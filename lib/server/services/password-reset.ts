import bcrypt from 'bcryptjs';
import { Op, type Transaction } from 'sequelize';
import { PasswordResetToken, User } from '@/db/models';
import { db } from '@/db';
import { ApiError } from '@/lib/server/errors';
import { FailureLimiter } from '@/lib/server/auth/rate-limit';
import { appLink } from '@/lib/server/mail/links';
import { passwordResetMessage } from '@/lib/server/mail/templates';
import { queueMail } from '@/lib/server/mail/transport';
import type { PasswordResetInput } from '@/lib/shared/validations/team';
import { recordAudit } from './audit';
import { hashToken, newToken } from '@/lib/server/auth/tokens';

export const RESET_MINUTES = 60;

/** The one answer to every reset request, whether or not the address has an account. */
export const RESET_REQUEST_ANSWER =
  'If an account uses this address, a message with a link to choose a new password is on its way. The link works once, for one hour.';

export type ResetTokenState = 'valid' | 'used' | 'expired' | 'unknown';

const STATE_MESSAGES: Record<Exclude<ResetTokenState, 'valid'>, string> = {
  used: 'This reset link has already been used. Ask for a new one if you still need it.',
  expired: 'This reset link has expired (links work for one hour). Ask for a new one.',
  unknown: 'This reset link is not valid. Check that you copied the whole address, or ask for a new one.',
};

// At most 3 messages per address in 15 minutes, so the form cannot be used to flood someone's inbox.
const requestLimiter = new FailureLimiter({ limit: 3, windowMs: 15 * 60_000 });

function stateOf(row: PasswordResetToken | null, now = new Date()): ResetTokenState {
  if (!row) return 'unknown';
  if (row.usedAt) return 'used';
  if (row.expiresAt.getTime() <= now.getTime()) return 'expired';
  return 'valid';
}

/**
 * Starts a reset: for a known address, stores a hashed single-use token and sends the link; for an
 * unknown one, does nothing. The caller answers RESET_REQUEST_ANSWER either way, at once: only the
 * in-memory flood count happens before the reply, and the account lookup, the token and the mail
 * all run after it, so neither the answer nor its timing says whether the address has an account.
 * Returns that background work (true when a message was handed to the mail server), for tests.
 */
export function requestPasswordReset(email: string): { delivery: Promise<boolean> } {
  if (!requestLimiter.tryAttempt(email)) return { delivery: Promise.resolve(false) };
  const delivery = (async () => {
    db();
    const user = await User.findOne({ where: { email } });
    if (!user) return false;
    const { token, hash } = newToken();
    const expiresAt = new Date(Date.now() + RESET_MINUTES * 60_000);
    await PasswordResetToken.create({ userId: user.id, tokenHash: hash, expiresAt, usedAt: null });
    return queueMail(passwordResetMessage({ to: user.email, link: appLink(`/reset-password/${token}`), expiresAt }), 'a password-reset message');
  })().catch((error: unknown) => {
    console.error('[switchback] could not start a password reset:', error instanceof Error ? error.message : error);
    return false;
  });
  return { delivery };
}

/** What a reset link's token is worth, for the reset page (no side effects). */
export async function inspectResetToken(token: string): Promise<ResetTokenState> {
  if (!/^[A-Za-z0-9_-]{43}$/.test(token)) return 'unknown';
  db();
  return stateOf(await PasswordResetToken.findOne({ where: { tokenHash: hashToken(token) } }));
}

/** Whether a reset link can be used, with the reason when not (for the reset page). */
export async function describeResetLink(token: string): Promise<{ state: ResetTokenState; message: string | null }> {
  const state = await inspectResetToken(token);
  return { state, message: state === 'valid' ? null : STATE_MESSAGES[state] };
}

/**
 * Sets a new password with a valid token, once: the token row is locked, marked used together with
 * the user's other open tokens, the user's earlier sessions are ended, and the change is audited,
 * all in one transaction.
 * @throws ApiError 410 for used, expired or unknown tokens.
 */
export async function completePasswordReset(input: PasswordResetInput): Promise<void> {
  const passwordHash = await bcrypt.hash(input.password, 10);
  await db().transaction(async (transaction) => {
    const row = await PasswordResetToken.findOne({ where: { tokenHash: hashToken(input.token) }, transaction, lock: transaction.LOCK.UPDATE });
    const state = stateOf(row);
    if (!row || state !== 'valid') throw new ApiError(410, STATE_MESSAGES[state as Exclude<ResetTokenState, 'valid'>]);
    await storeNewPassword(row.userId, passwordHash, 'account.password-reset', transaction);
  });
}

/**
 * Inside the caller's transaction: sets a user's new password hash, ends every session signed in
 * before (on every device), spends the user's open reset links, and audits the change as `action`.
 * Shared by the reset link and the change on the account page.
 */
export async function storeNewPassword(userId: number, passwordHash: string, action: 'account.password-reset' | 'account.password-change', transaction: Transaction): Promise<void> {
  await User.update({ passwordHash }, { where: { id: userId }, transaction });
  await User.increment('sessionEpoch', { by: 1, where: { id: userId }, transaction });
  await PasswordResetToken.update({ usedAt: new Date() }, { where: { userId, usedAt: { [Op.is]: null } }, transaction });
  await recordAudit({ actorId: userId, studyId: null, action, details: {} }, transaction);
}
