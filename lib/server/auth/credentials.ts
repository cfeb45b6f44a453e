import bcrypt from 'bcryptjs';
import { User } from '@/db/models';
import { db } from '@/db';
import { signInAccountLimiter, signInAddressLimiter } from './rate-limit';

export const TOO_MANY_ATTEMPTS = 'TooManyAttempts';

// Compared against when the e-mail is unknown, so a miss costs the same time as a wrong password.
const DUMMY_HASH = '$2b$10$CwTycUXWue0Thq9StjUM0uJ8.ZtpwvKM3W4aEaHc9zxtO6rXkhHdW';

/**
 * Checks an e-mail and password. Returns the user on success, null on a wrong pair; throws
 * TOO_MANY_ATTEMPTS once the e-mail has 10 failures in 15 minutes (from any address) or the client
 * address has 30 (whichever e-mails they named). `address` comes from `clientAddress`, never from a
 * header the client controls. A success clears the account's count, not the address's, so signing
 * in to one's own account does not buy more guesses at others.
 */
export async function verifyCredentials(email: string, password: string, address: string) {
  const normalised = email.trim().toLowerCase();
  if (signInAccountLimiter.isBlocked(normalised) || signInAddressLimiter.isBlocked(address)) throw new Error(TOO_MANY_ATTEMPTS);
  db();
  const user = await User.findOne({ where: { email: normalised } });
  const ok = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !ok) {
    signInAccountLimiter.recordFailure(normalised);
    signInAddressLimiter.recordFailure(address);
    return null;
  }
  signInAccountLimiter.reset(normalised);
  return { id: String(user.id), email: user.email, name: user.name, sessionEpoch: user.sessionEpoch };
}
