import type { Sequelize } from 'sequelize';
import { User } from './user';
import { Study } from './study';
import { Membership } from './membership';
import { AuditEvent } from './audit-event';
import { Design, DesignComment, DesignVersion, PriorSet } from './planner';
import { ApiKey, Participant } from './item-bank';
import { Invitation, NoticeSetting, PasswordResetToken } from './team';
import { PowerRun } from './power';
import { ParticipantSession, Stage2Answer } from './session';
import { AdaptiveCalibrationAnswer } from './adaptive-calibration';
// account security: address confirmation and signed-out sessions
import { EmailConfirmationToken, EndedSession } from './account';
import { Analysis } from './analysis';
// session page (issue 13): participant links
import { SessionLink } from './session-link';
// real rewards: reward settings per version, the payout ledger, participants' payment details
import { Payout, PaymentDetail, RewardSettings } from './payout';

export { User, Study, Membership, AuditEvent, PriorSet, Design, DesignVersion, DesignComment };
export { ApiKey, Participant };
export { Invitation, PasswordResetToken, NoticeSetting };
export { PowerRun };
export { ParticipantSession, Stage2Answer };
export { EmailConfirmationToken, EndedSession };
export { Analysis };
export { AdaptiveCalibrationAnswer };
export { SessionLink };
export { Payout, PaymentDetail, RewardSettings };

/**
 * Registers every model and association on one Sequelize instance. A new model is added here
 * (and gets a migration in db/migrations): this is the one place the app learns about tables.
 */
export function registerModels(sequelize: Sequelize): void {
  User.register(sequelize);
  Study.register(sequelize);
  Membership.register(sequelize);
  AuditEvent.register(sequelize);
  PriorSet.register(sequelize);
  Design.register(sequelize);
  DesignVersion.register(sequelize);
  DesignComment.register(sequelize);
  ApiKey.register(sequelize);
  Participant.register(sequelize);
  Invitation.register(sequelize);
  PasswordResetToken.register(sequelize);
  NoticeSetting.register(sequelize);
  PowerRun.register(sequelize);
  EmailConfirmationToken.register(sequelize);
  EndedSession.register(sequelize);
  ParticipantSession.register(sequelize);
  Stage2Answer.register(sequelize);
  Analysis.register(sequelize);
  AdaptiveCalibrationAnswer.register(sequelize);
  SessionLink.register(sequelize);
  RewardSettings.register(sequelize);
  Payout.register(sequelize);
  PaymentDetail.register(sequelize);

  Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  Membership.belongsTo(Study, { foreignKey: 'studyId', as: 'study' });
  Study.hasMany(Membership, { foreignKey: 'studyId', as: 'memberships' });
  User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' });
  AuditEvent.belongsTo(User, { foreignKey: 'actorId', as: 'actor' });
  Design.hasMany(DesignVersion, { foreignKey: 'designId', as: 'versions' });
  DesignVersion.belongsTo(Design, { foreignKey: 'designId', as: 'design' });
  Design.hasMany(DesignComment, { foreignKey: 'designId', as: 'comments' });
  DesignComment.belongsTo(User, { foreignKey: 'authorId', as: 'author' });
  ApiKey.belongsTo(User, { foreignKey: 'createdBy', as: 'creator' });
  Stage2Answer.belongsTo(Participant, { foreignKey: 'participantRef', as: 'participant' });
  Participant.hasMany(Stage2Answer, { foreignKey: 'participantRef', as: 'stage2Answers' });
  Invitation.belongsTo(Study, { foreignKey: 'studyId', as: 'study' });
  Invitation.belongsTo(User, { foreignKey: 'invitedBy', as: 'inviter' });
}
