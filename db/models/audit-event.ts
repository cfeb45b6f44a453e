import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<number>;
  declare actorId: number | null;
  declare studyId: number | null;
  declare action: string;
  declare details: Record<string, unknown>;
  declare createdAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    AuditEvent.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        actorId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        studyId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        action: { type: DataTypes.STRING(64), allowNull: false },
        details: { type: DataTypes.JSON, allowNull: false, defaultValue: {} },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'audit_events', updatedAt: false },
    );
  }
}
