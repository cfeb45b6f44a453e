import bcrypt from 'bcryptjs';
import type { Sequelize } from 'sequelize';
import { Membership, Study, User } from '../models';
import { demoAccounts, demoGroup } from './demo-accounts.mjs';

export const DEMO_STUDY_NAME = 'Rainy-day savings: when do savers switch?';

/** Demo users (one per role) and the demo study they share. Safe to run again: finds before creating. */
export async function seed(sequelize: Sequelize): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const users = [];
    for (const account of demoAccounts) {
      // Demo addresses are confirmed, so the demo's invitation flows work without a real inbox.
      const [user] = await User.findOrCreate({
        where: { email: account.email },
        defaults: { email: account.email, name: account.name, passwordHash: await bcrypt.hash(account.password, 10), emailVerifiedAt: new Date() },
        transaction,
      });
      if (!user.emailVerifiedAt) await user.update({ emailVerifiedAt: new Date() }, { transaction });
      users.push({ user, role: account.role });
    }
    const owner = users.find((u) => u.role === 'owner')!.user;
    const existing = await Membership.findOne({
      where: { userId: owner.id, role: 'owner' },
      include: [{ model: Study, as: 'study', where: { name: DEMO_STUDY_NAME } }],
      transaction,
    });
    const study =
      (existing && (await Study.findByPk(existing.studyId, { transaction }))) ||
      (await Study.create(
        {
          name: DEMO_STUDY_NAME,
          description:
            `${demoGroup} (a fictional group): hypothetical choices between a smaller bonus paid sooner and a larger ` +
            'one paid later, planned so that each participant meets pairs inside their own preference-reversal zone.',
        },
        { transaction },
      ));
    for (const { user, role } of users) {
      await Membership.findOrCreate({ where: { userId: user.id, studyId: study.id }, defaults: { userId: user.id, studyId: study.id, role }, transaction });
    }
  });
}
