import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false };
const userRef = (onDelete: 'CASCADE' | 'SET NULL', allowNull: boolean) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: 'users', key: 'id' },
  onDelete,
});

// Tokens are stored only as SHA-256 hashes (hex): a leaked table does not let anyone use a link.
export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.createTable('invitations', {
    id,
    study_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'studies', key: 'id' }, onDelete: 'CASCADE' },
    email: { type: DataTypes.STRING(254), allowNull: false },
    role: { type: DataTypes.ENUM('viewer', 'operator', 'editor', 'owner'), allowNull: false },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    invited_by: userRef('SET NULL', true),
    expires_at: { type: DataTypes.DATE, allowNull: false },
    accepted_at: { type: DataTypes.DATE, allowNull: true },
    accepted_by: userRef('SET NULL', true),
    revoked_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('invitations', ['study_id', 'email'], { name: 'invitations_study_email' });
  await q.createTable('password_reset_tokens', {
    id,
    user_id: userRef('CASCADE', false),
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    used_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.createTable('notice_settings', {
    user_id: { ...userRef('CASCADE', false), primaryKey: true },
    design_frozen: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    power_run_finished: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.dropTable('notice_settings');
  await q.dropTable('password_reset_tokens');
  await q.dropTable('invitations');
}
