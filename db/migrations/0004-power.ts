import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.createTable('power_runs', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    study_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'studies', key: 'id' }, onDelete: 'CASCADE' },
    design_version_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'design_versions', key: 'id' }, onDelete: 'CASCADE' },
    label: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
    spec: { type: DataTypes.JSON, allowNull: false },
    status: { type: DataTypes.ENUM('queued', 'running', 'finished', 'cancelled', 'interrupted', 'failed'), allowNull: false, defaultValue: 'queued' },
    completed: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    total: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    message: { type: DataTypes.TEXT, allowNull: true },
    tally: { type: DataTypes.JSON, allowNull: true },
    result: { type: DataTypes.JSON, allowNull: true },
    engine_version: { type: DataTypes.STRING(40), allowNull: false },
    started_at: { type: DataTypes.DATE, allowNull: true },
    heartbeat_at: { type: DataTypes.DATE, allowNull: true },
    finished_at: { type: DataTypes.DATE, allowNull: true },
    created_by: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('power_runs', ['study_id', 'created_at'], { name: 'power_runs_study_created' });
  await q.addIndex('power_runs', ['status'], { name: 'power_runs_status' });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.dropTable('power_runs');
}
