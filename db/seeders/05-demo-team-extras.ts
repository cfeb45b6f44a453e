import type { Sequelize } from 'sequelize';
import { AuditEvent, Invitation, Membership, Study, User } from '../models';
import { newToken } from '../../lib/server/auth/tokens';
import { demoAccounts } from './demo-accounts.mjs';
import { DEMO_STUDY_NAME } from './01-demo-team';

/** A fictional colleague the demo owner has invited but who has not joined yet. */
export const DEMO_PENDING_INVITEE = 'juniper.analyst@example.org';

/**
 * One open invitation in the demo study, so the Team page shows how pending invitations look. Its
 * link was never mailed (only the token's hash is stored): "Resend" puts a working link in the
 * local mailbox. Safe to run again: an open invitation for the address is left as it is.
 */
export async function seed(sequelize: Sequelize): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const ownerAccount = demoAccounts.find((a) => a.role === 'owner')!;
    const owner = await User.findOne({ where: { email: ownerAccount.email }, transaction });
    if (!owner) return;
    const membership = await Membership.findOne({
      where: { userId: owner.id, role: 'owner' },
      include: [{ model: Study, as: 'study', where: { name: DEMO_STUDY_NAME } }],
      transaction,
    });
    if (!membership) return;
    const existing = await Invitation.findOne({ where: { studyId: membership.studyId, email: DEMO_PENDING_INVITEE }, transaction });
    if (existing) return;
    const invitation = await Invitation.create(
      {
        studyId: membership.studyId,
        email: DEMO_PENDING_INVITEE,
        role: 'viewer',
        tokenHash: newToken().hash,
        invitedBy: owner.id,
        expiresAt: new Date(Date.now() + 7 * 24 * 60 * 60 * 1000),
        acceptedAt: null,
        acceptedBy: null,
        revokedAt: null,
      },
      { transaction },
    );
    await AuditEvent.create(
      { actorId: owner.id, studyId: membership.studyId, action: 'invitation.create', details: { invitationId: invitation.id, email: DEMO_PENDING_INVITEE, role: 'viewer' } },
      { transaction },
    );
  });
}
