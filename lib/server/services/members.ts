import { QueryTypes, type Transaction } from 'sequelize';
import { Membership, User } from '@/db/models';
import { db } from '@/db';
import { ConflictError, ForbiddenError, NotFoundError } from '@/lib/server/errors';
import type { Role } from '@/lib/shared/roles';
import { recordAudit } from './audit';

export const LAST_OWNER_MESSAGE = 'A study needs at least one owner. Make someone else an owner first.';

/**
 * Locks the study's owner memberships (SELECT ... FOR UPDATE) and returns their user ids. Every
 * change that could remove an owner takes this lock first, so two owners demoting or removing each
 * other at the same moment are serialised and the second one sees the first one's change.
 */
async function lockOwners(studyId: number, transaction: Transaction): Promise<number[]> {
  const rows = await db().query<{ user_id: number }>(
    `SELECT user_id FROM memberships WHERE study_id = :studyId AND role = 'owner' ORDER BY id FOR UPDATE`,
    { replacements: { studyId }, type: QueryTypes.SELECT, transaction },
  );
  return rows.map((r) => r.user_id);
}

async function lockMember(studyId: number, userId: number, transaction: Transaction) {
  const membership = await Membership.findOne({ where: { studyId, userId }, transaction, lock: transaction.LOCK.UPDATE });
  if (!membership) throw new NotFoundError('This person is not a member of this study.');
  const user = await User.findByPk(userId, { attributes: ['email'], transaction });
  return { membership, email: user?.email ?? '' };
}

/**
 * Changes a member's role (owners only; the route checks that). Demoting the last owner is refused.
 * @throws NotFoundError for a non-member; ConflictError (409) for the last owner.
 */
export async function changeMemberRole(actorId: number, studyId: number, userId: number, role: Role) {
  return db().transaction(async (transaction) => {
    const owners = await lockOwners(studyId, transaction);
    const { membership, email } = await lockMember(studyId, userId, transaction);
    const from = membership.role;
    if (from === role) return { userId, role, changed: false };
    if (from === 'owner' && owners.length <= 1) throw new ConflictError(LAST_OWNER_MESSAGE);
    await membership.update({ role }, { transaction });
    await recordAudit({ actorId, studyId, action: 'member.role-change', details: { userId, email, from, to: role } }, transaction);
    return { userId, role, changed: true };
  });
}

/**
 * Removes a member. Owners may remove anyone; every member may remove themself (leave). The last
 * owner can do neither.
 * @throws NotFoundError for a non-member; ForbiddenError when a non-owner removes someone else;
 * ConflictError (409) for the last owner.
 */
export async function removeMember(actor: { id: number; role: Role }, studyId: number, userId: number): Promise<{ left: boolean }> {
  return db().transaction(async (transaction) => {
    const owners = await lockOwners(studyId, transaction);
    const { membership, email } = await lockMember(studyId, userId, transaction);
    const leaving = actor.id === userId;
    if (!leaving && actor.role !== 'owner') throw new ForbiddenError('Only owners can remove other members.');
    if (membership.role === 'owner' && owners.length <= 1) throw new ConflictError(LAST_OWNER_MESSAGE);
    await membership.destroy({ transaction });
    await recordAudit(
      { actorId: actor.id, studyId, action: leaving ? 'member.leave' : 'member.remove', details: { userId, email, role: membership.role } },
      transaction,
    );
    return { left: leaving };
  });
}
