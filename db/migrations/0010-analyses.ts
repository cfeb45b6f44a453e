import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

/**
 * Saved analyses of observed choices: one row per study, name and version. An analysis states
 * its exclusion rules and tests before the results are computed, cites the frozen design's hash,
 * and keeps its result and paragraph as computed (a new computation is a new version).
 */
export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.createTable('analyses', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    study_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'studies', key: 'id' }, onDelete: 'CASCADE' },
    design_version_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'design_versions', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(120), allowNull: false },
    version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    design_hash: { type: DataTypes.CHAR(64), allowNull: false },
    engine_version: { type: DataTypes.STRING(40), allowNull: false },
    settings: { type: DataTypes.JSON, allowNull: false },
    result: { type: DataTypes.JSON, allowNull: false },
    paragraph: { type: DataTypes.TEXT, allowNull: false },
    created_by: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('analyses', ['study_id', 'name', 'version'], { unique: true, name: 'analyses_study_name_version' });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.dropTable('analyses');
}
