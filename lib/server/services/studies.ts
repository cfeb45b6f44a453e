import { QueryTypes } from 'sequelize';
import { Membership, Study, User } from '@/db/models';
import { db } from '@/db';
import { ConflictError } from '@/lib/server/errors';
import type { Role } from '@/lib/shared/roles';
import type { CreateStudyInput, UpdateStudyInput } from '@/lib/shared/validations/study';
import { recordAudit } from './audit';

export type StudySummary = { id: number; name: string; description: string; role: Role; version: number; updatedAt: string };

export function studyJson(study: Study) {
  return {
    id: study.id,
    name: study.name,
    description: study.description,
    version: study.version,
    createdAt: study.createdAt.toISOString(),
    updatedAt: study.updatedAt.toISOString(),
  };
}

/** The studies a user belongs to, most recently changed first, with the user's role in each. */
export async function listStudies(userId: number): Promise<StudySummary[]> {
  const rows = await db().query<{ id: number; name: string; description: string; role: Role; version: number; updated_at: Date }>(
    `SELECT s.id, s.name, s.description, s.version, s.updated_at, m.role
       FROM studies s JOIN memberships m ON m.study_id = s.id
      WHERE m.user_id = :userId
      ORDER BY s.updated_at DESC, s.id DESC`,
    { replacements: { userId }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ id: r.id, name: r.name, description: r.description, role: r.role, version: r.version, updatedAt: new Date(r.updated_at).toISOString() }));
}

/** Creates a study; its creator becomes its owner. */
export async function createStudy(userId: number, input: CreateStudyInput) {
  return db().transaction(async (transaction) => {
    const study = await Study.create({ name: input.name, description: input.description ?? '' }, { transaction });
    await Membership.create({ userId, studyId: study.id, role: 'owner' }, { transaction });
    await recordAudit({ actorId: userId, studyId: study.id, action: 'study.create', details: { name: study.name } }, transaction);
    return study;
  });
}

/**
 * Applies a change only if the stored version is still the one the caller read; otherwise 409 and
 * nothing is written. The version check and the write are one UPDATE, so two racing writers
 * cannot both win.
 */
export async function updateStudy(actorId: number, studyId: number, input: UpdateStudyInput) {
  return db().transaction(async (transaction) => {
    const { version, ...changes } = input;
    const [affected] = await Study.update(
      { ...changes, version: version + 1 },
      { where: { id: studyId, version }, transaction },
    );
    if (affected === 0) throw new ConflictError('This study was changed by someone else since you loaded it. Reload to see the current version; your text is kept in the form.');
    await recordAudit({ actorId, studyId, action: 'study.update', details: { ...changes, version: version + 1 } }, transaction);
    return (await Study.findByPk(studyId, { transaction }))!;
  });
}

/** Deletes a study and everything in it (memberships cascade); the audit trail keeps a record. */
export async function deleteStudy(actorId: number, study: Study) {
  await db().transaction(async (transaction) => {
    await recordAudit({ actorId, studyId: study.id, action: 'study.delete', details: { name: study.name } }, transaction);
    await study.destroy({ transaction });
  });
}

/** Members of a study with their roles, owners first. */
export async function listMembers(studyId: number) {
  const rows = await Membership.findAll({
    where: { studyId },
    include: [{ model: User, as: 'user', attributes: ['id', 'name', 'email'] }],
    order: [['createdAt', 'ASC']],
  });
  const order: Role[] = ['owner', 'editor', 'operator', 'viewer'];
  return rows
    .map((m) => {
      const user = (m as unknown as { user: User }).user;
      return { userId: user.id, name: user.name, email: user.email, role: m.role, since: m.createdAt.toISOString() };
    })
    .sort((a, b) => order.indexOf(a.role) - order.indexOf(b.role));
}
