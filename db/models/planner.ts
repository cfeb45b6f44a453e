import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { DesignSpec, FrozenDesign, PriorValues } from '@/lib/shared/validations/planner';

// Sequelize writes the column name (`field`) into each attribute object it is given, so every
// attribute needs its own object: a shared constant would map designId onto study_id.
const ID = () => ({ type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true });
const FK = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false });
const OPTIONAL_FK = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: true });

/** A named prior over the two discount rates, per study. */
export class PriorSet extends Model<InferAttributes<PriorSet>, InferCreationAttributes<PriorSet>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare name: string;
  declare values: PriorValues;
  declare source: 'manual' | 'pilot';
  declare notes: string;
  declare version: CreationOptional<number>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    PriorSet.init(
      {
        id: ID(),
        studyId: FK(),
        name: { type: DataTypes.STRING(120), allowNull: false },
        values: { type: DataTypes.JSON, allowNull: false },
        source: { type: DataTypes.ENUM('manual', 'pilot'), allowNull: false, defaultValue: 'manual' },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 1 },
        createdBy: OPTIONAL_FK(),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'prior_sets' },
    );
  }
}

/** A candidate design (the editable draft). */
export class Design extends Model<InferAttributes<Design>, InferCreationAttributes<Design>> {
  declare id: CreationOptional<number>;
  declare studyId: number;
  declare name: string;
  declare spec: DesignSpec;
  declare version: CreationOptional<number>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    Design.init(
      {
        id: ID(),
        studyId: FK(),
        name: { type: DataTypes.STRING(120), allowNull: false },
        spec: { type: DataTypes.JSON, allowNull: false },
        version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 1 },
        createdBy: OPTIONAL_FK(),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'designs' },
    );
  }
}

/** A frozen, immutable version of a design: `content` is hashed (SHA-256 of canonical JSON) into `hash`. */
export class DesignVersion extends Model<InferAttributes<DesignVersion>, InferCreationAttributes<DesignVersion>> {
  declare id: CreationOptional<number>;
  declare designId: number;
  declare studyId: number;
  declare number: number;
  declare hash: string;
  declare content: FrozenDesign;
  declare frozenBy: number | null;
  declare createdAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    DesignVersion.init(
      {
        id: ID(),
        designId: FK(),
        studyId: FK(),
        number: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        hash: { type: DataTypes.CHAR(64), allowNull: false },
        content: { type: DataTypes.JSON, allowNull: false },
        frozenBy: OPTIONAL_FK(),
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'design_versions', updatedAt: false },
    );
  }
}

export class DesignComment extends Model<InferAttributes<DesignComment>, InferCreationAttributes<DesignComment>> {
  declare id: CreationOptional<number>;
  declare designId: number;
  declare authorId: number | null;
  declare text: string;
  declare createdAt: CreationOptional<Date>;

  static register(sequelize: Sequelize) {
    DesignComment.init(
      { id: ID(), designId: FK(), authorId: OPTIONAL_FK(), text: { type: DataTypes.TEXT, allowNull: false }, createdAt: DataTypes.DATE },
      { sequelize, tableName: 'design_comments', updatedAt: false },
    );
  }
}
