import bcrypt from 'bcryptjs';
import { UniqueConstraintError } from 'sequelize';
import { User } from '@/db/models';
import { db } from '@/db';
import { ApiError, ConflictError, ValidationError } from '@/lib/server/errors';
import { TOO_MANY_ATTEMPTS, verifyCredentials } from '@/lib/server/auth/credentials';
import type { PasswordChangeInput, SignUpInput } from '@/lib/shared/validations/user';
import { storeNewPassword } from './password-reset';

/** Creates an account; an e-mail already in use is a 409. */
export async function createUser(input: SignUpInput) {
  db();
  try {
    const user = await User.create({ email: input.email, name: input.name, passwordHash: await bcrypt.hash(input.password, 10) });
    return { id: user.id, email: user.email, name: user.name };
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new ConflictError('An account with this e-mail already exists. Sign in instead.');
    throw error;
  }
}

/**
 * Changes a signed-in user's password after checking the current one (wrong guesses count
 * towards the sign-in limit of that e-mail and address). Every session, this one included, ends;
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
