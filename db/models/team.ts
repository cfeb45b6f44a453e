import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { ROLES, type Role } from '@/lib/shared/roles';

// Spread into each field: Sequelize writes column names into the definition objects it is given.
const ID = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const OPTIONAL_FK = { type: DataTypes.INTEGER.UNSIGNED, allowNull: true };
const HASH = { type: DataTypes.CHAR(64), allowNull: false, unique: true };

/** An invitation to join a study with a role; the link's token is kept only as a SHA-256 hash. */
export class Invitation extends Model<InferAttributes<Invitation>, InferCreationAttributes<Invitation>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare email: string;
  declare role: Role;
  declare tokenHash: string;
  declare invitedBy: number | null;
  declare expiresAt: Date;
  declare acceptedAt: Date | null;
  declare acceptedBy: number | null;
  declare revokedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    Invitation.init(
      {
        id: { ...ID },
        studyId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        email: { type: DataTypes.STRING(254), allowNull: false },
        role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
        tokenHash: { ...HASH },
        invitedBy: { ...OPTIONAL_FK },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        acceptedAt: { type: DataTypes.DATE, allowNull: true },
        acceptedBy: { ...OPTIONAL_FK },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'invitations' },
    );
  }
}

/** A single-use password-reset token (hashed), valid until `expiresAt`. */
export class PasswordResetToken extends Model<InferAttributes<PasswordResetToken>, InferCreationAttributes<PasswordResetToken>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    PasswordResetToken.init(
      {
        id: { ...ID },
        userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        tokenHash: { ...HASH },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        usedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'password_reset_tokens', updatedAt: false },
    );
  }
}

/** Which optional e-mail notices a user wants; no row means all off. */
export class NoticeSetting extends Model<InferAttributes<NoticeSetting>, InferCreationAttributes<NoticeSetting>> {
  declare userId: number;
  declare designFrozen: boolean;
  declare powerRunFinished: boolean;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    NoticeSetting.init(
      {
        userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, primaryKey: true },
        designFrozen: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        powerRunFinished: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'notice_settings' },
    );
  }
}
