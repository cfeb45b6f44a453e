import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

/**
 * Switchback's own session page: a participant link per frozen version (operators open, pause and
 * close it), with the consent text and instructions the team writes, the completion code, and an
 * optional redirect that passes the participant id along. A session run through a link keeps the
 * link and when consent was given and the instructions were read; its session token (the
 * participant's httpOnly cookie) is kept as a SHA-256 in `participant_sessions.token_hash`.
 */
export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.createTable('session_links', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    study_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'studies', key: 'id' }, onDelete: 'CASCADE' },
    design_version_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'design_versions', key: 'id' }, onDelete: 'CASCADE' },
    // the link's path segment: random, unguessable, binary-compared
    slug: { type: 'VARCHAR(32) CHARACTER SET ascii COLLATE ascii_bin', allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    title: { type: DataTypes.STRING(160), allowNull: false },
    status: { type: DataTypes.ENUM('open', 'paused', 'closed'), allowNull: false, defaultValue: 'open' },
    consent_text: { type: DataTypes.TEXT, allowNull: false },
    instructions: { type: DataTypes.TEXT, allowNull: false },
    completion_code: { type: DataTypes.STRING(64), allowNull: false },
    redirect_url: { type: DataTypes.STRING(2000), allowNull: true },
    participant_param: { type: DataTypes.STRING(40), allowNull: false },
    created_by: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('session_links', ['slug'], { unique: true, name: 'session_links_slug' });
  await q.addIndex('session_links', ['study_id'], { name: 'session_links_study' });
  await q.addColumn('participant_sessions', 'session_link_id', {
    type: DataTypes.INTEGER.UNSIGNED,
    allowNull: true,
    references: { model: 'session_links', key: 'id' },
    onDelete: 'SET NULL',
  });
  await q.addColumn('participant_sessions', 'consented_at', { type: DataTypes.DATE, allowNull: true });
  await q.addColumn('participant_sessions', 'instructions_read_at', { type: DataTypes.DATE, allowNull: true });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.removeColumn('participant_sessions', 'instructions_read_at');
  await q.removeColumn('participant_sessions', 'consented_at');
  // removing the column drops its foreign key first (MariaDB needs the constraint gone)
  const [fks] = (await q.sequelize.query(
    "SELECT CONSTRAINT_NAME AS name FROM information_schema.KEY_COLUMN_USAGE WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = 'participant_sessions' AND COLUMN_NAME = 'session_link_id' AND REFERENCED_TABLE_NAME IS NOT NULL",
  )) as [Array<{ name: string }>, unknown];
  for (const fk of fks) await q.removeConstraint('participant_sessions', fk.name);
  await q.removeColumn('participant_sessions', 'session_link_id');
  await q.dropTable('session_links');
}
