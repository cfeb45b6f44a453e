import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

const ID = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const FK = { type: DataTypes.INTEGER.UNSIGNED, allowNull: false };
const OPTIONAL_FK = { type: DataTypes.INTEGER.UNSIGNED, allowNull: true };
// BIGINT comes back as a string from the driver; money stays whole minor units, read with Number()
// only below 2^53 (checked where amounts are written).
const MINOR = { type: DataTypes.BIGINT.UNSIGNED, allowNull: false };
const OPTIONAL_MINOR = { type: DataTypes.BIGINT.UNSIGNED, allowNull: true };

export type PayoutStatus = 'scheduled' | 'held' | 'sending' | 'sent' | 'failed' | 'cancelled';
export const PAYOUT_STATUSES: readonly PayoutStatus[] = ['scheduled', 'held', 'sending', 'sent', 'failed', 'cancelled'];

/** Real rewards of one frozen version: on or off, the draw's blocks, the cap and the approval threshold (minor units). */
export class RewardSettings extends Model<InferAttributes<RewardSettings>, InferCreationAttributes<RewardSettings>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare designVersionId: number;
  declare enabled: boolean;
  declare rule: CreationOptional<'random-incentive'>;
  declare blocks: 'both' | 'calibration' | 'probe';
  declare currency: string;
  declare capMinor: number | string | null;
  declare approvalThresholdMinor: number | string | null;
  declare updatedBy: number | null;
  declare updatedAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    RewardSettings.init(
      {
        id: { ...ID },
        studyId: { ...FK },
        designVersionId: { ...FK },
        enabled: { type: DataTypes.BOOLEAN, allowNull: false },
        rule: { type: DataTypes.ENUM('random-incentive'), allowNull: false, defaultValue: 'random-incentive' },
        blocks: { type: DataTypes.ENUM('both', 'calibration', 'probe'), allowNull: false },
        currency: { type: DataTypes.CHAR(3), allowNull: false },
        capMinor: { ...OPTIONAL_MINOR },
        approvalThresholdMinor: { ...OPTIONAL_MINOR },
        updatedBy: { ...OPTIONAL_FK },
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'reward_settings', createdAt: false },
    );
  }
}

/** One paid participant in the payout ledger: the drawn choice, what is owed, when, and where the payment stands. */
export class Payout extends Model<InferAttributes<Payout>, InferCreationAttributes<Payout>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare designVersionId: number;
  declare participantId: string;
  declare itemId: string;
  declare itemBlock: 'calibration' | 'probe';
  declare chosen: 'sooner' | 'later';
  declare chosenAmountMinor: number | string;
  declare amountMinor: number | string;
  declare currency: string;
  declare delayDays: number;
  /** YYYY-MM-DD */
  declare completedOn: string;
  /** YYYY-MM-DD */
  declare dueDate: string;
  declare seed: number;
  /** ids of the eligible items in draw order */
  declare eligibleItems: string[];
  declare status: PayoutStatus;
  declare reason: string | null;
  declare providerReference: string | null;
  declare idempotencyKey: string;
  declare attempts: CreationOptional<number>;
  declare nextAttemptAt: Date | null;
  declare claimedUntil: CreationOptional<Date | null>;
  declare needsApproval: boolean;
  declare approvedBy: CreationOptional<number | null>;
  declare approvedAt: CreationOptional<Date | null>;
  declare cancelledBy: CreationOptional<number | null>;
  declare cancelledAt: CreationOptional<Date | null>;
  declare sentAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    Payout.init(
      {
        id: { ...ID },
        studyId: { ...FK },
        designVersionId: { ...FK },
        participantId: { type: DataTypes.STRING(128), allowNull: false },
        itemId: { type: DataTypes.STRING(64), allowNull: false },
        itemBlock: { type: DataTypes.ENUM('calibration', 'probe'), allowNull: false },
        chosen: { type: DataTypes.ENUM('sooner', 'later'), allowNull: false },
        chosenAmountMinor: { ...MINOR },
        amountMinor: { ...MINOR },
        currency: { type: DataTypes.CHAR(3), allowNull: false },
        delayDays: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        completedOn: { type: DataTypes.DATEONLY, allowNull: false },
        dueDate: { type: DataTypes.DATEONLY, allowNull: false },
        seed: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        eligibleItems: { type: DataTypes.JSON, allowNull: false },
        status: { type: DataTypes.ENUM(...PAYOUT_STATUSES), allowNull: false },
        reason: { type: DataTypes.STRING(500), allowNull: true },
        providerReference: { type: DataTypes.STRING(64), allowNull: true },
        idempotencyKey: { type: DataTypes.CHAR(36), allowNull: false },
        attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
        nextAttemptAt: { type: DataTypes.DATE, allowNull: true },
        claimedUntil: { type: DataTypes.DATE, allowNull: true },
        needsApproval: { type: DataTypes.BOOLEAN, allowNull: false },
        approvedBy: { ...OPTIONAL_FK },
        approvedAt: { type: DataTypes.DATE, allowNull: true },
        cancelledBy: { ...OPTIONAL_FK },
        cancelledAt: { type: DataTypes.DATE, allowNull: true },
        sentAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'payouts' },
    );
  }
}

/** How to pay one participant of a study: an e-mail address for the reward link (nothing more is kept). */
export class PaymentDetail extends Model<InferAttributes<PaymentDetail>, InferCreationAttributes<PaymentDetail>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare participantId: string;
  declare email: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    PaymentDetail.init(
      {
        id: { ...ID },
        studyId: { ...FK },
        participantId: { type: DataTypes.STRING(128), allowNull: false },
        email: { type: DataTypes.STRING(254), allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'payment_details' },
    );
  }
}
