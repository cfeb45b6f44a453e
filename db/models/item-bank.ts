import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

const ID = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const FK = { type: DataTypes.INTEGER.UNSIGNED, allowNull: false };
const OPTIONAL_FK = { type: DataTypes.INTEGER.UNSIGNED, allowNull: true };

/** A study's API key for the probe-items API, bound to one frozen design version; only the SHA-256 of the secret is kept. */
export class ApiKey extends Model<InferAttributes<ApiKey>, InferCreationAttributes<ApiKey>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare designVersionId: number;
  declare name: string;
  declare prefix: string;
  declare secretHash: string;
  declare createdBy: number | null;
  declare lastUsedAt: Date | null;
  declare revokedAt: Date | null;
  declare revokedBy: number | null;
  /** server: the lab's back end, full powers; browser: safe inside a public page (participant sessions only, listed origins only) */
  declare kind: CreationOptional<'server' | 'browser'>;
  /** origins (scheme://host[:port]) a browser may call from with this key; null = none */
  declare allowedOrigins: CreationOptional<string[] | null>;
  /** presentation settings the key's calibration block and scoring use (as an export with the same settings) */
  declare delayUnit: CreationOptional<'days' | 'weeks' | 'months'>;
  declare minGap: CreationOptional<number>;
  /** null: the version's default seed */
  declare seed: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    ApiKey.init(
      {
        id: { ...ID },
        studyId: { ...FK },
        designVersionId: { ...FK },
        name: { type: DataTypes.STRING(120), allowNull: false },
        prefix: { type: DataTypes.STRING(16), allowNull: false },
        secretHash: { type: DataTypes.CHAR(64), allowNull: false },
        createdBy: { ...OPTIONAL_FK },
        lastUsedAt: { type: DataTypes.DATE, allowNull: true },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
        revokedBy: { ...OPTIONAL_FK },
        kind: { type: DataTypes.ENUM('server', 'browser'), allowNull: false, defaultValue: 'server' },
        allowedOrigins: { type: DataTypes.JSON, allowNull: true },
        delayUnit: { type: DataTypes.ENUM('days', 'weeks', 'months'), allowNull: false, defaultValue: 'days' },
        minGap: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 2 },
        seed: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'api_keys', updatedAt: false },
    );
  }
}

/** One participant served personalised probe items (through the API, a batch upload or the session page); immutable once written. */
export class Participant extends Model<InferAttributes<Participant>, InferCreationAttributes<Participant>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare designVersionId: number;
  declare participantId: string;
  declare responsesHash: string;
  declare responses: Record<string, string>;
  declare result: Record<string, unknown>;
  declare flag: string | null;
  declare source: 'api' | 'batch' | 'page';
  declare apiKeyId: number | null;
  declare servedBy: number | null;
  declare createdAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    Participant.init(
      {
        id: { ...ID },
        studyId: { ...FK },
        designVersionId: { ...FK },
        participantId: { type: DataTypes.STRING(128), allowNull: false },
        responsesHash: { type: DataTypes.CHAR(64), allowNull: false },
        responses: { type: DataTypes.JSON, allowNull: false },
        result: { type: DataTypes.JSON, allowNull: false },
        flag: { type: DataTypes.STRING(32), allowNull: true },
        source: { type: DataTypes.ENUM('api', 'batch', 'page'), allowNull: false },
        apiKeyId: { ...OPTIONAL_FK },
        servedBy: { ...OPTIONAL_FK },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'participants', updatedAt: false },
    );
  }
}
