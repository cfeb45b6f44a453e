import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false };
const userRef = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' });

// Proof of an address: when its owner opened a confirmation link (null until then; accounts from
// before this migration confirm on their next invitation). Links and ended sessions are kept only
// as SHA-256 hashes (hex), like every other token.
export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.addColumn('users', 'email_verified_at', { type: DataTypes.DATE, allowNull: true });
  await q.createTable('email_confirmation_tokens', {
    id,
    user_id: userRef(),
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    used_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  // One row per signed-out session token, until the token would have expired anyway.
  await q.createTable('ended_sessions', {
    id,
    user_id: userRef(),
    session_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('ended_sessions', ['expires_at'], { name: 'ended_sessions_expires_at' });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.dropTable('ended_sessions');
  await q.dropTable('email_confirmation_tokens');
  await q.removeColumn('users', 'email_verified_at');
}
