import bcrypt from 'bcryptjs';
import { User } from '@/db/models';
import { db } from '@/db';
import { signInLimiter } from './rate-limit';

export const TOO_MANY_ATTEMPTS = 'TooManyAttempts';

// Compared against when the e-mail is unknown, so a miss costs the same time as a wrong password.
const DUMMY_HASH = '$2b$10$CwTycUXWue0Thq9StjUM0uJ8.ZtpwvKM3W4aEaHc9zxtO6rXkhHdW';

/**
 * Checks an e-mail and password. Returns the user on success, null on a wrong pair; throws
 * TOO_MANY_ATTEMPTS once the (e-mail, address) pair has 10 failures in 15 minutes.
 */
export async function verifyCredentials(email: string, password: string, address: string) {
  const normalised = email.trim().toLowerCase();
  const key = `${normalised}|${address}`;
  if (signInLimiter.isBlocked(key)) throw new Error(TOO_MANY_ATTEMPTS);
  db();
  const user = await User.findOne({ where: { email: normalised } });
  const ok = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !ok) {
    signInLimiter.recordFailure(key);
    return null;
  }
  signInLimiter.reset(key);
  return { id: String(user.id), email: user.email, name: user.name, sessionEpoch: user.sessionEpoch };
}
