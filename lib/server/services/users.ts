import bcrypt from 'bcryptjs';
import { UniqueConstraintError } from 'sequelize';
import { User } from '@/db/models';
import { db } from '@/db';
import { ApiError, ValidationError } from '@/lib/server/errors';
import { TOO_MANY_ATTEMPTS, verifyCredentials } from '@/lib/server/auth/credentials';
import { FailureLimiter } from '@/lib/server/auth/rate-limit';
import { appLink } from '@/lib/server/mail/links';
import { accountExistsMessage } from '@/lib/server/mail/templates';
import { queueMail } from '@/lib/server/mail/transport';
import { sendAddressConfirmation } from '@/lib/server/services/email-confirmation';
import type { PasswordChangeInput, SignUpInput } from '@/lib/shared/validations/user';
import { storeNewPassword } from './password-reset';

/** The one answer to every accepted sign-up, whether or not the address already had an account. */
export const SIGN_UP_ANSWER =
  'Thank you. We sent a message to this address with a link to confirm it. If the address already has an account, sign in with its password instead.';

// Hashing a password is deliberately slow, so sign-ups are throttled: 3 per address and 50 per
// client address in an hour (a lab behind one gateway still signs up a team).
const signUpEmailLimiter = new FailureLimiter({ limit: 3, windowMs: 60 * 60_000 });
const signUpClientLimiter = new FailureLimiter({ limit: 50, windowMs: 60 * 60_000 });

/**
 * Signs up: for a new address, creates the account (unconfirmed) and mails a confirmation link; for
 * an address that has an account, changes nothing and mails its owner a notice. Both take the same
 * path up to the reply (the password is hashed either way, one insert is tried) and the mail work
 * runs after it, so neither the answer nor its timing says whether the address was known.
 * Returns the background work (true when a message was handed to the mail server), for tests.
 * @throws ApiError 429 when the address or the client has used up its sign-ups.
 */
export async function signUp(input: SignUpInput, clientAddress: string): Promise<{ mail: Promise<boolean> }> {
  // Checked and counted before the slow hash, so a blocked flood costs no CPU.
  if (signUpEmailLimiter.isBlocked(input.email) || !signUpClientLimiter.tryAttempt(clientAddress)) {
    throw new ApiError(429, 'Too many sign-ups from here or for this address. Wait an hour and try again.');
  }
  signUpEmailLimiter.recordFailure(input.email);
  db();
  const passwordHash = await bcrypt.hash(input.password, 10);
  let created: User | null = null;
  try {
    created = await User.create({ email: input.email, name: input.name, passwordHash });
  } catch (error) {
    if (!(error instanceof UniqueConstraintError)) throw error;
  }
  const mail = created
    ? sendAddressConfirmation({ id: created.id, email: created.email }).then((sent) => sent.delivery, logSignUpMailFailure)
    : queueMail(accountExistsMessage({ to: input.email, signInLink: appLink('/sign-in'), resetLink: appLink('/forgot-password') }), 'an account-exists notice');
  return { mail };
}

/** The confirmation link could not be stored (the mail itself never throws): logged, not answered. */
function logSignUpMailFailure(error: unknown): false {
  console.error('[switchback] could not store an address confirmation:', error instanceof Error ? error.message : error);
  return false;
}

/**
 * Changes a signed-in user's password after checking the current one (wrong guesses count
 * towards the sign-in limits of the account and the client address). Every session, this one included, ends;
 * open reset links stop working; the change is audited in the same transaction.
 * @throws ValidationError naming currentPassword when it is wrong; ApiError 429 when blocked.
 */
export async function changePassword(user: { id: number; email: string }, input: PasswordChangeInput, address: string): Promise<void> {
  let verified;
  try {
    verified = await verifyCredentials(user.email, input.currentPassword, address);
  } catch (error) {
    if (error instanceof Error && error.message === TOO_MANY_ATTEMPTS) throw new ApiError(429, 'Too many wrong passwords. Wait 15 minutes and try again.');
    throw error;
  }
  if (!verified || Number(verified.id) !== user.id) throw new ValidationError([{ path: 'currentPassword', message: 'This is not your current password.' }]);
  const passwordHash = await bcrypt.hash(input.newPassword, 10);
  await db().transaction((transaction) => storeNewPassword(user.id, passwordHash, 'account.password-change', transaction));
}
