import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

/**
 * Adaptive calibration's answers, one row per participant and step: the session API's
 * "next calibration item" step stores each answer here, and every later step (and a repeat of
 * the same step) is recomputed from these rows, so a step is idempotent. UNIQUE (study_id,
 * participant_id, step) makes parallel or repeated submissions of one step create one row.
 */
export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.createTable('adaptive_calibration_answers', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    study_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'studies', key: 'id' }, onDelete: 'CASCADE' },
    design_version_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'design_versions', key: 'id' }, onDelete: 'CASCADE' },
    // Exact ids (binary collation): "P1" and "p1" are two participants (see 0008).
    participant_id: { type: 'VARCHAR(128) CHARACTER SET utf8mb4 COLLATE utf8mb4_bin', allowNull: false },
    step: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
    item_id: { type: 'VARCHAR(64) CHARACTER SET utf8mb4 COLLATE utf8mb4_bin', allowNull: false },
    chosen: { type: DataTypes.ENUM('sooner', 'later'), allowNull: false },
    source: { type: DataTypes.ENUM('api', 'page'), allowNull: false },
    api_key_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'api_keys', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('adaptive_calibration_answers', ['study_id', 'participant_id', 'step'], { unique: true, name: 'adaptive_answers_participant_step' });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.dropTable('adaptive_calibration_answers');
}
