import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false };
const studyRef = { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'studies', key: 'id' }, onDelete: 'CASCADE' };
const versionRef = { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'design_versions', key: 'id' }, onDelete: 'CASCADE' };
const userRef = { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' };

/**
 * API keys (stored only as the SHA-256 of the secret) bound to one frozen design version, and the
 * participants served through them. UNIQUE (study_id, participant_id) is what makes parallel
 * requests for one participant create one record: the losers of the race read the winner back.
 */
export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.createTable('api_keys', {
    id,
    study_id: studyRef,
    design_version_id: versionRef,
    name: { type: DataTypes.STRING(120), allowNull: false },
    prefix: { type: DataTypes.STRING(16), allowNull: false },
    secret_hash: { type: DataTypes.CHAR(64), allowNull: false },
    created_by: userRef,
    last_used_at: { type: DataTypes.DATE, allowNull: true },
    revoked_at: { type: DataTypes.DATE, allowNull: true },
    revoked_by: userRef,
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('api_keys', ['secret_hash'], { unique: true, name: 'api_keys_secret_hash' });
  await q.addIndex('api_keys', ['study_id'], { name: 'api_keys_study' });
  await q.createTable('participants', {
    id,
    study_id: studyRef,
    design_version_id: versionRef,
    participant_id: { type: DataTypes.STRING(128), allowNull: false },
    responses_hash: { type: DataTypes.CHAR(64), allowNull: false },
    responses: { type: DataTypes.JSON, allowNull: false },
    result: { type: DataTypes.JSON, allowNull: false },
    flag: { type: DataTypes.STRING(32), allowNull: true },
    source: { type: DataTypes.ENUM('api', 'batch'), allowNull: false },
    api_key_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'api_keys', key: 'id' }, onDelete: 'SET NULL' },
    served_by: userRef,
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('participants', ['study_id', 'participant_id'], { unique: true, name: 'participants_study_participant' });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.dropTable('participants');
  await q.dropTable('api_keys');
}
