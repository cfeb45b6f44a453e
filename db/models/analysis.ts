import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A saved, named, versioned analysis of a frozen design version's observed choices. */
export class Analysis extends Model<InferAttributes<Analysis>, InferCreationAttributes<Analysis>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare designVersionId: number;
  declare name: string;
  declare version: number;
  declare designHash: string;
  declare engineVersion: string;
  /** the stated rules: exclusions, test alternative, α, zone model */
  declare settings: object;
  /** the stored analysis (lib/shared/results) */
  declare result: object;
  declare paragraph: string;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    Analysis.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        studyId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        designVersionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        designHash: { type: DataTypes.CHAR(64), allowNull: false },
        engineVersion: { type: DataTypes.STRING(40), allowNull: false },
        settings: { type: DataTypes.JSON, allowNull: false },
        result: { type: DataTypes.JSON, allowNull: false },
        paragraph: { type: DataTypes.TEXT, allowNull: false },
        createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'analyses', updatedAt: false },
    );
  }
}
