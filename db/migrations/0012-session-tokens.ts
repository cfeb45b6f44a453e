import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

/**
 * A participant session run from a public page (a browser key) is bound to an unguessable token
 * handed out when the session starts; only its SHA-256 is kept. Every later call for that
 * participant must carry the token, so a public key alone cannot act as, or read, anyone else.
 */
export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.addColumn('participant_sessions', 'token_hash', { type: DataTypes.CHAR(64), allowNull: true });
  await q.addIndex('participant_sessions', ['token_hash'], { unique: true, name: 'participant_sessions_token' });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.removeIndex('participant_sessions', 'participant_sessions_token');
  await q.removeColumn('participant_sessions', 'token_hash');
}
