import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A single-use link (hashed) that proves its opener receives mail at the account's address. */
export class EmailConfirmationToken extends Model<InferAttributes<EmailConfirmationToken>, InferCreationAttributes<EmailConfirmationToken>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    EmailConfirmationToken.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        usedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'email_confirmation_tokens', updatedAt: false },
    );
  }
}

/** A session token ended by signing out (its id's hash), refused until it would have expired. */
export class EndedSession extends Model<InferAttributes<EndedSession>, InferCreationAttributes<EndedSession>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare sessionHash: string;
  declare expiresAt: Date;
  declare createdAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    EndedSession.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        sessionHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'ended_sessions', updatedAt: false },
    );
  }
}
