import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false };
const studyRef = { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'studies', key: 'id' }, onDelete: 'CASCADE' };
const userRef = { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' };
const timestamps = { created_at: { type: DataTypes.DATE, allowNull: false }, updated_at: { type: DataTypes.DATE, allowNull: false } };

export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.createTable('prior_sets', {
    id,
    study_id: studyRef,
    name: { type: DataTypes.STRING(120), allowNull: false },
    values: { type: DataTypes.JSON, allowNull: false },
    source: { type: DataTypes.ENUM('manual', 'pilot'), allowNull: false, defaultValue: 'manual' },
    notes: { type: DataTypes.TEXT, allowNull: false },
    version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 1 },
    created_by: userRef,
    ...timestamps,
  });
  await q.createTable('designs', {
    id,
    study_id: studyRef,
    name: { type: DataTypes.STRING(120), allowNull: false },
    spec: { type: DataTypes.JSON, allowNull: false },
    version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 1 },
    created_by: userRef,
    ...timestamps,
  });
  await q.createTable('design_versions', {
    id,
    design_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'designs', key: 'id' }, onDelete: 'CASCADE' },
    study_id: studyRef,
    number: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    hash: { type: DataTypes.CHAR(64), allowNull: false },
    content: { type: DataTypes.JSON, allowNull: false },
    frozen_by: userRef,
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('design_versions', ['design_id', 'number'], { unique: true, name: 'design_versions_design_number' });
  await q.addIndex('design_versions', ['study_id', 'hash'], { name: 'design_versions_study_hash' });
  await q.createTable('design_comments', {
    id,
    design_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'designs', key: 'id' }, onDelete: 'CASCADE' },
    author_id: userRef,
    text: { type: DataTypes.TEXT, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.dropTable('design_comments');
  await q.dropTable('design_versions');
  await q.dropTable('designs');
  await q.dropTable('prior_sets');
}
