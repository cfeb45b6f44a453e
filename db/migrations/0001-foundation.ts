import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false };
const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};

export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.createTable('users', {
    id,
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: false },
    ...timestamps,
  });
  await q.createTable('studies', {
    id,
    name: { type: DataTypes.STRING(160), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false },
    version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 1 },
    ...timestamps,
  });
  await q.createTable('memberships', {
    id,
    user_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    study_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'studies', key: 'id' }, onDelete: 'CASCADE' },
    role: { type: DataTypes.ENUM('viewer', 'operator', 'editor', 'owner'), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('memberships', ['user_id', 'study_id'], { unique: true, name: 'memberships_user_study' });
  await q.createTable('audit_events', {
    id,
    // No foreign keys: the trail must outlive the users and studies it mentions.
    actor_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    study_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    action: { type: DataTypes.STRING(64), allowNull: false },
    details: { type: DataTypes.JSON, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('audit_events', ['study_id', 'created_at'], { name: 'audit_events_study_time' });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.dropTable('audit_events');
  await q.dropTable('memberships');
  await q.dropTable('studies');
  await q.dropTable('users');
}
