import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** One answer of a participant's adaptive calibration, at its step (0-based); unique per participant and step. */
export class AdaptiveCalibrationAnswer extends Model<InferAttributes<AdaptiveCalibrationAnswer>, InferCreationAttributes<AdaptiveCalibrationAnswer>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare designVersionId: number;
  declare participantId: string;
  declare step: number;
  declare itemId: string;
  declare chosen: 'sooner' | 'later';
  declare source: 'api' | 'page';
  declare apiKeyId: number | null;
  declare createdAt: Date;

  static register(sequelize: Sequelize) {
    AdaptiveCalibrationAnswer.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        studyId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        designVersionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        participantId: { type: DataTypes.STRING(128), allowNull: false },
        step: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
        itemId: { type: DataTypes.STRING(64), allowNull: false },
        chosen: { type: DataTypes.ENUM('sooner', 'later'), allowNull: false },
        source: { type: DataTypes.ENUM('api', 'page'), allowNull: false },
        apiKeyId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        createdAt: { type: DataTypes.DATE, allowNull: false },
      },
      { sequelize, tableName: 'adaptive_calibration_answers', timestamps: false },
    );
  }
}
