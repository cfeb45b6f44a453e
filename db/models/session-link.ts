import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** open: participants may start and continue; paused: nobody may answer until it is reopened; closed: for good. */
export type SessionLinkStatus = 'open' | 'paused' | 'closed';

/**
 * A participant link to Switchback's own session page, for one frozen design version: the team's
 * consent text and instructions, the completion code shown at the end and an optional redirect
 * that passes the participant id along (in the query parameter `participantParam`).
 */
export class SessionLink extends Model<InferAttributes<SessionLink>, InferCreationAttributes<SessionLink>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare designVersionId: number;
  /** the random path segment of the link (/s/{slug}) */
  declare slug: string;
  /** the team's name for the link (operators' screens only) */
  declare name: string;
  /** the heading participants see */
  declare title: string;
  declare status: CreationOptional<SessionLinkStatus>;
  declare consentText: string;
  declare instructions: string;
  declare completionCode: string;
  declare redirectUrl: string | null;
  /** the query parameter the participant id arrives in (and is passed on in to the redirect) */
  declare participantParam: string;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    SessionLink.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        studyId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        designVersionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        slug: { type: DataTypes.STRING(32), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        title: { type: DataTypes.STRING(160), allowNull: false },
        status: { type: DataTypes.ENUM('open', 'paused', 'closed'), allowNull: false, defaultValue: 'open' },
        consentText: { type: DataTypes.TEXT, allowNull: false },
        instructions: { type: DataTypes.TEXT, allowNull: false },
        completionCode: { type: DataTypes.STRING(64), allowNull: false },
        redirectUrl: { type: DataTypes.STRING(2000), allowNull: true },
        participantParam: { type: DataTypes.STRING(40), allowNull: false },
        createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'session_links' },
    );
  }
}
