import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false };
const studyRef = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'studies', key: 'id' }, onDelete: 'CASCADE' });
const versionRef = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'design_versions', key: 'id' }, onDelete: 'CASCADE' });
const userRef = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' });
// Exact ids (binary collation): "P1" and "p1" are two participants (see 0008).
const participantId = () => ({ type: 'VARCHAR(128) CHARACTER SET utf8mb4 COLLATE utf8mb4_bin', allowNull: false });
// Money is whole minor units (cent, yen) in BIGINT: never a floating-point column.
const minor = (allowNull: boolean) => ({ type: DataTypes.BIGINT.UNSIGNED, allowNull });

/**
 * Real rewards (the random incentive system):
 * - `reward_settings`: per frozen version, whether its participants are paid for real, which
 *   blocks the paid choice is drawn from, a per-participant cap and the amount above which an
 *   owner approves a payout before it is sent.
 * - `payouts`: the ledger, one row per paid participant (UNIQUE study and participant: a
 *   participant is drawn once). Each row keeps the seed and the eligible item ids, so the draw can
 *   be re-derived; `idempotency_key` (UNIQUE) is sent to the payment provider as the order's
 *   external id, so a repeated send is answered with the first order instead of paying twice.
 * - `payment_details`: the minimum needed to pay a participant (an e-mail address for a reward
 *   link). A payout without them is held.
 */
export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.createTable('reward_settings', {
    id,
    study_id: studyRef(),
    design_version_id: versionRef(),
    enabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    rule: { type: DataTypes.ENUM('random-incentive'), allowNull: false, defaultValue: 'random-incentive' },
    blocks: { type: DataTypes.ENUM('both', 'calibration', 'probe'), allowNull: false, defaultValue: 'both' },
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    cap_minor: minor(true),
    approval_threshold_minor: minor(true),
    updated_by: userRef(),
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('reward_settings', ['design_version_id'], { unique: true, name: 'reward_settings_version' });

  await q.createTable('payouts', {
    id,
    study_id: studyRef(),
    design_version_id: versionRef(),
    participant_id: participantId(),
    item_id: { type: 'VARCHAR(64) CHARACTER SET utf8mb4 COLLATE utf8mb4_bin', allowNull: false },
    item_block: { type: DataTypes.ENUM('calibration', 'probe'), allowNull: false },
    chosen: { type: DataTypes.ENUM('sooner', 'later'), allowNull: false },
    chosen_amount_minor: minor(false),
    amount_minor: minor(false),
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    delay_days: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    completed_on: { type: DataTypes.DATEONLY, allowNull: false },
    due_date: { type: DataTypes.DATEONLY, allowNull: false },
    seed: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    eligible_items: { type: DataTypes.JSON, allowNull: false },
    status: { type: DataTypes.ENUM('scheduled', 'held', 'sending', 'sent', 'failed', 'cancelled'), allowNull: false },
    reason: { type: DataTypes.STRING(500), allowNull: true },
    provider_reference: { type: DataTypes.STRING(64), allowNull: true },
    idempotency_key: { type: DataTypes.CHAR(36), allowNull: false },
    attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    next_attempt_at: { type: DataTypes.DATE, allowNull: true },
    claimed_until: { type: DataTypes.DATE, allowNull: true },
    needs_approval: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    approved_by: userRef(),
    approved_at: { type: DataTypes.DATE, allowNull: true },
    cancelled_by: userRef(),
    cancelled_at: { type: DataTypes.DATE, allowNull: true },
    sent_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('payouts', ['study_id', 'participant_id'], { unique: true, name: 'payouts_study_participant' });
  await q.addIndex('payouts', ['idempotency_key'], { unique: true, name: 'payouts_idempotency_key' });
  await q.addIndex('payouts', ['status', 'due_date'], { name: 'payouts_status_due' });

  await q.createTable('payment_details', {
    id,
    study_id: studyRef(),
    participant_id: participantId(),
    email: { type: DataTypes.STRING(254), allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('payment_details', ['study_id', 'participant_id'], { unique: true, name: 'payment_details_study_participant' });

  // One daily summary per study and day: the row is claimed before the mail goes out, so two
  // server processes (or a restart) never send the same day's summary twice.
  await q.createTable('payout_summaries', {
    id,
    study_id: studyRef(),
    summary_date: { type: DataTypes.DATEONLY, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('payout_summaries', ['study_id', 'summary_date'], { unique: true, name: 'payout_summaries_study_day' });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.dropTable('payout_summaries');
  await q.dropTable('payment_details');
  await q.dropTable('payouts');
  await q.dropTable('reward_settings');
}
