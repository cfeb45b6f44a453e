import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

const ID = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const FK = { type: DataTypes.INTEGER.UNSIGNED, allowNull: false };
const OPTIONAL_FK = { type: DataTypes.INTEGER.UNSIGNED, allowNull: true };

/** The furthest step a session reached; "abandoned" is read, not stored (see sessionState). */
export type StoredSessionStatus = 'started' | 'calibrated' | 'served' | 'completed';
/** Where answers came from: the session API (a key), Switchback's session page, or an operator's CSV upload. */
export type AnswerSource = 'api' | 'page' | 'upload';

/**
 * One participant's run through both blocks of a frozen version, once Switchback knows of it
 * (calibration block fetched for them, consent on the session page, calibration answers scored by
 * the probe-items API, stage-2 answers received). Participants served by a batch upload have a
 * `participants` row and no session row.
 */
export class ParticipantSession extends Model<InferAttributes<ParticipantSession>, InferCreationAttributes<ParticipantSession>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare designVersionId: number;
  declare participantId: string;
  declare status: StoredSessionStatus;
  declare source: AnswerSource;
  declare apiKeyId: number | null;
  /** calibration answers given so far on the session page (item id → 'sooner' | 'later'), before serving */
  declare calibrationAnswers: Record<string, string> | null;
  declare startedAt: Date;
  declare calibratedAt: Date | null;
  declare servedAt: Date | null;
  declare completedAt: Date | null;
  declare lastActivityAt: Date;
  /** SHA-256 of the session token handed to a browser session (null for server-key sessions) */
  declare tokenHash: CreationOptional<string | null>;
  /** session page (migration 0013): the participant link, when consent was given and the instructions read */
  declare sessionLinkId: CreationOptional<number | null>;
  declare consentedAt: CreationOptional<Date | null>;
  declare instructionsReadAt: CreationOptional<Date | null>;

  static register(sequelize: Sequelize) {
    ParticipantSession.init(
      {
        id: { ...ID },
        studyId: { ...FK },
        designVersionId: { ...FK },
        participantId: { type: DataTypes.STRING(128), allowNull: false },
        status: { type: DataTypes.ENUM('started', 'calibrated', 'served', 'completed'), allowNull: false },
        source: { type: DataTypes.ENUM('api', 'page', 'upload'), allowNull: false },
        apiKeyId: { ...OPTIONAL_FK },
        calibrationAnswers: { type: DataTypes.JSON, allowNull: true },
        startedAt: { type: DataTypes.DATE, allowNull: false },
        calibratedAt: { type: DataTypes.DATE, allowNull: true },
        servedAt: { type: DataTypes.DATE, allowNull: true },
        completedAt: { type: DataTypes.DATE, allowNull: true },
        lastActivityAt: { type: DataTypes.DATE, allowNull: false },
        tokenHash: { type: DataTypes.CHAR(64), allowNull: true },
        sessionLinkId: { ...OPTIONAL_FK },
        consentedAt: { type: DataTypes.DATE, allowNull: true },
        instructionsReadAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'participant_sessions', timestamps: false },
    );
  }
}

/** One answer to one served stage-2 (probe block) item; unique per participant and item. */
export class Stage2Answer extends Model<InferAttributes<Stage2Answer>, InferCreationAttributes<Stage2Answer>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  /** participants.id of the served participant */
  declare participantRef: number;
  declare itemId: string;
  declare chosen: 'SS' | 'LL';
  declare responseMs: number | null;
  declare sideShown: 'left' | 'right' | null;
  declare source: AnswerSource;
  declare apiKeyId: number | null;
  declare recordedBy: number | null;
  declare createdAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    Stage2Answer.init(
      {
        id: { ...ID },
        studyId: { ...FK },
        participantRef: { ...FK },
        itemId: { type: DataTypes.STRING(64), allowNull: false },
        chosen: { type: DataTypes.ENUM('SS', 'LL'), allowNull: false },
        responseMs: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        sideShown: { type: DataTypes.ENUM('left', 'right'), allowNull: true },
        source: { type: DataTypes.ENUM('api', 'page', 'upload'), allowNull: false },
        apiKeyId: { ...OPTIONAL_FK },
        recordedBy: { ...OPTIONAL_FK },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'stage2_answers', updatedAt: false },
    );
  }
}
