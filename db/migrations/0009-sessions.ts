import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false };
const studyRef = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'studies', key: 'id' }, onDelete: 'CASCADE' });
const keyRef = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'api_keys', key: 'id' }, onDelete: 'SET NULL' });

/**
 * The two-stage session end to end:
 * - `participant_sessions`: one row per study and participant once Switchback knows of them
 *   before or after serving (calibration block fetched for them, session page, stage-2 answers);
 *   its status is the furthest step reached. "Abandoned" is not stored: it is read as "not
 *   completed and no activity for `studies.session_idle_minutes`", so changing the idle time
 *   needs no rewrite.
 * - `stage2_answers`: one row per participant and served probe-block item. UNIQUE
 *   (participant_ref, item_id) is what makes parallel or repeated submissions create one record.
 * - API keys get a kind (server or browser), the origins a browser may call from, and the
 *   presentation settings (delay unit, gap, seed) their calibration block and scoring use, so an
 *   exported file, the calibration endpoint and the scoring of answers agree.
 * - participants.source gains 'page' (served through Switchback's own session page).
 */
export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.addColumn('studies', 'session_idle_minutes', { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 60 });
  await q.addColumn('api_keys', 'kind', { type: DataTypes.ENUM('server', 'browser'), allowNull: false, defaultValue: 'server' });
  await q.addColumn('api_keys', 'allowed_origins', { type: DataTypes.JSON, allowNull: true });
  await q.addColumn('api_keys', 'delay_unit', { type: DataTypes.ENUM('days', 'weeks', 'months'), allowNull: false, defaultValue: 'days' });
  await q.addColumn('api_keys', 'min_gap', { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 2 });
  await q.addColumn('api_keys', 'seed', { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
  await q.changeColumn('participants', 'source', { type: DataTypes.ENUM('api', 'batch', 'page'), allowNull: false });

  await q.createTable('participant_sessions', {
    id,
    study_id: studyRef(),
    design_version_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'design_versions', key: 'id' }, onDelete: 'CASCADE' },
    participant_id: { type: DataTypes.STRING(128), allowNull: false },
    status: { type: DataTypes.ENUM('started', 'calibrated', 'served', 'completed'), allowNull: false },
    source: { type: DataTypes.ENUM('api', 'page', 'upload'), allowNull: false },
    api_key_id: keyRef(),
    calibration_answers: { type: DataTypes.JSON, allowNull: true },
    started_at: { type: DataTypes.DATE, allowNull: false },
    calibrated_at: { type: DataTypes.DATE, allowNull: true },
    served_at: { type: DataTypes.DATE, allowNull: true },
    completed_at: { type: DataTypes.DATE, allowNull: true },
    last_activity_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('participant_sessions', ['study_id', 'participant_id'], { unique: true, name: 'participant_sessions_study_participant' });

  await q.createTable('stage2_answers', {
    id,
    study_id: studyRef(),
    participant_ref: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'participants', key: 'id' }, onDelete: 'CASCADE' },
    item_id: { type: DataTypes.STRING(64), allowNull: false },
    chosen: { type: DataTypes.ENUM('SS', 'LL'), allowNull: false },
    response_ms: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    side_shown: { type: DataTypes.ENUM('left', 'right'), allowNull: true },
    source: { type: DataTypes.ENUM('api', 'page', 'upload'), allowNull: false },
    api_key_id: keyRef(),
    recorded_by: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('stage2_answers', ['participant_ref', 'item_id'], { unique: true, name: 'stage2_answers_participant_item' });
  await q.addIndex('stage2_answers', ['study_id'], { name: 'stage2_answers_study' });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.dropTable('stage2_answers');
  await q.dropTable('participant_sessions');
  // Participants served through the session page have no place in the older schema.
  await q.sequelize.query("DELETE FROM participants WHERE source = 'page'");
  await q.changeColumn('participants', 'source', { type: DataTypes.ENUM('api', 'batch'), allowNull: false });
  await q.removeColumn('api_keys', 'seed');
  await q.removeColumn('api_keys', 'min_gap');
  await q.removeColumn('api_keys', 'delay_unit');
  await q.removeColumn('api_keys', 'allowed_origins');
  await q.removeColumn('api_keys', 'kind');
  await q.removeColumn('studies', 'session_idle_minutes');
}
