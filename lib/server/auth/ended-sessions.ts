import type { JWT } from 'next-auth/jwt';
import { Op } from 'sequelize';
import { EndedSession, User } from '@/db/models';
import { db } from '@/db';
import { hashToken } from '@/lib/server/auth/tokens';

const FALLBACK_LIFETIME_MS = 7 * 24 * 60 * 60 * 1000;

/**
 * Ends the session a token belongs to, on the server: its id's hash is recorded until the token
 * would have expired, so the same cookie (or a copy of it) is refused from then on. A token from
 * before session ids existed has no id to record; then every session of the user ends, as after a
 * password change (the epoch rises). Expired records are cleared on the way.
 */
export async function endSession(token: JWT | null | undefined): Promise<void> {
  const userId = Number(token?.sub);
  if (!token || !Number.isSafeInteger(userId) || userId <= 0) return;
  db();
  if (typeof token.sid !== 'string' || !token.sid) {
    const epoch = typeof token.epoch === 'number' ? token.epoch : 0;
    await User.increment('sessionEpoch', { by: 1, where: { id: userId, sessionEpoch: epoch } });
    return;
  }
  const expiresAt = new Date(typeof token.exp === 'number' ? token.exp * 1000 : Date.now() + FALLBACK_LIFETIME_MS);
  await EndedSession.destroy({ where: { expiresAt: { [Op.lt]: new Date() } } });
  await EndedSession.findOrCreate({ where: { sessionHash: hashToken(token.sid) }, defaults: { userId, sessionHash: hashToken(token.sid), expiresAt } });
}

/** True when the session with this id was signed out. */
export async function sessionEnded(sid: unknown): Promise<boolean> {
  if (typeof sid !== 'string' || !sid) return false;
  db();
  return (await EndedSession.count({ where: { sessionHash: hashToken(sid) } })) > 0;
}
