import { getServerSession } from 'next-auth';
import { getToken } from 'next-auth/jwt';
import type { NextRequest } from 'next/server';
import { Membership, Study, User } from '@/db/models';
import { db } from '@/db';
import { NotFoundError, UnauthorizedError, ForbiddenError } from '@/lib/server/errors';
import { authEnv } from '@/lib/server/env';
import { parseEntityId } from '@/lib/server/route-ids';
import { sessionEnded } from '@/lib/server/auth/ended-sessions';
import { authOptions } from './options';
import { roleAtLeast, type Role } from '@/lib/shared/roles';

/** The signed-in account; `emailVerified` once its owner opened a confirmation link. */
export type SessionUser = { id: number; email: string; name: string; emailVerified: boolean };

/**
 * The account behind a session token, or null when it no longer stands: the user was deleted,
 * their password was reset or changed after the token was issued (the epochs differ), or this
 * session was signed out (its id is recorded as ended). Name and e-mail are read fresh, so a
 * rename shows at once.
 */
async function currentAccount(id: number, epoch: unknown, sid: unknown): Promise<SessionUser | null> {
  if (!Number.isInteger(id) || id <= 0) return null;
  db();
  const [user, ended] = await Promise.all([User.findByPk(id, { attributes: ['id', 'email', 'name', 'sessionEpoch', 'emailVerifiedAt'] }), sessionEnded(sid)]);
  if (!user || ended || user.sessionEpoch !== (typeof epoch === 'number' ? epoch : 0)) return null;
  return { id: user.id, email: user.email, name: user.name, emailVerified: user.emailVerifiedAt != null };
}

/** The signed-in user of an API request (from the JWT cookie), or null. */
export async function getRequestUser(request: NextRequest): Promise<SessionUser | null> {
  const token = await getToken({ req: request, secret: authEnv().NEXTAUTH_SECRET });
  if (!token) return null;
  return currentAccount(Number(token.sub), token.epoch, token.sid);
}

/** The signed-in user of an API request; 401 when there is none. */
export async function requireUser(request: NextRequest): Promise<SessionUser> {
  const user = await getRequestUser(request);
  if (!user) throw new UnauthorizedError();
  return user;
}

/** Parses a study id from a route parameter; anything malformed is simply "not found". */
export function parseStudyId(raw: string | undefined): number {
  return parseEntityId(raw, 'Study');
}

/**
 * Every study-scoped handler calls this first. Not signed in → 401; not a member → 404 (so a
 * study's existence does not leak); a role below `needed` → 403. Returns the user, role and study.
 */
export async function requireRole(request: NextRequest, rawStudyId: string | undefined, needed: Role) {
  const user = await requireUser(request);
  const studyId = parseStudyId(rawStudyId);
  db();
  const membership = await Membership.findOne({
    where: { userId: user.id, studyId },
    include: [{ model: Study, as: 'study', required: true }],
  });
  if (!membership) throw new NotFoundError('Study not found.');
  if (!roleAtLeast(membership.role, needed)) throw new ForbiddenError();
  const study = (membership as unknown as { study: Study }).study;
  return { user, role: membership.role, study };
}

/** The signed-in user of a page render (server components), or null. */
export async function getPageUser(): Promise<SessionUser | null> {
  const session = await getServerSession(authOptions);
  if (!session?.user) return null;
  return currentAccount(Number(session.user.id), session.user.epoch, session.user.sid);
}
