import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { PowerRunSpec, PowerStatus } from '@/lib/shared/validations/power';

/**
 * A saved power simulation of one frozen design version: its spec, progress (replicates done
 * of total, heartbeat while running), and when finished the merged tally and summary.
 */
export class PowerRun extends Model<InferAttributes<PowerRun>, InferCreationAttributes<PowerRun>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare designVersionId: number;
  declare label: string;
  declare spec: PowerRunSpec;
  declare status: CreationOptional<PowerStatus>;
  declare completed: CreationOptional<number>;
  declare total: number;
  declare message: CreationOptional<string | null>;
  /** the PowerTally (lib/design) when finished */
  declare tally: CreationOptional<object | null>;
  /** the PowerSummary plus method text when finished */
  declare result: CreationOptional<object | null>;
  declare engineVersion: string;
  declare startedAt: CreationOptional<Date | null>;
  declare heartbeatAt: CreationOptional<Date | null>;
  declare finishedAt: CreationOptional<Date | null>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    PowerRun.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        studyId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        designVersionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        label: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        spec: { type: DataTypes.JSON, allowNull: false },
        status: { type: DataTypes.ENUM('queued', 'running', 'finished', 'cancelled', 'interrupted', 'failed'), allowNull: false, defaultValue: 'queued' },
        completed: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
        total: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        message: { type: DataTypes.TEXT, allowNull: true },
        tally: { type: DataTypes.JSON, allowNull: true },
        result: { type: DataTypes.JSON, allowNull: true },
        engineVersion: { type: DataTypes.STRING(40), allowNull: false },
        startedAt: { type: DataTypes.DATE, allowNull: true },
        heartbeatAt: { type: DataTypes.DATE, allowNull: true },
        finishedAt: { type: DataTypes.DATE, allowNull: true },
        createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'power_runs' },
    );
  }
}
