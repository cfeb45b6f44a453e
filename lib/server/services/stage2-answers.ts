import { rawExecute, rawPipeline, rawQuery, settled, sqlDate, type RawResult, type RawStatement } from '@/db';
import type { AnswerSource } from '@/db/models/session';
import { ConflictError, ValidationError } from '@/lib/server/errors';
import { decodeJson } from '@/db/json';
import { drawPayoutOnCompletion, type RewardPromise } from './payouts-draw';

/** One answer to one served stage-2 item, as every writer hands it in. */
export type Stage2AnswerInput = {
  itemId: string;
  /** SS: the smaller-sooner option was chosen; LL: the larger-later one */
  chosen: 'SS' | 'LL';
  responseMs?: number | null;
  /** where the smaller-sooner option was shown */
  sideShown?: 'left' | 'right' | null;
};

export type RecordAnswersInput = {
  studyId: number;
  /** when given (the key's or the link's version), a participant served with another version is refused */
  designVersionId?: number;
  participantId: string;
  answers: readonly Stage2AnswerInput[];
  source: AnswerSource;
  apiKeyId?: number | null;
  /** the operator who uploaded (source 'upload') */
  recordedBy?: number | null;
};

/** What a writer gets back: how much of the participant's stage-2 block is answered. */
export type RecordAnswersResult = {
  participantId: string;
  /** answers of this call that were new (0 for a replay) */
  recorded: number;
  answered: number;
  itemCount: number;
  status: 'served' | 'completed';
  /** served items still without an answer, in presentation order */
  unanswered: string[];
  /** real rewards: once completed, the drawn choice, what is paid and when (absent when the version pays no real rewards) */
  reward?: RewardPromise;
};

type ServedParticipant = { ref: number; designVersionId: number; itemIds: string[] };

// Participants rows never change once written, so what the answers endpoint needs of them is
// cached per process (the rows can only disappear with their study: the insert then skips the
// rows and the entry is dropped).
const servedCache = new Map<string, ServedParticipant>();
const SERVED_CACHE_LIMIT = 20_000;

const SELECT_SERVED = "SELECT id, design_version_id, JSON_EXTRACT(result, '$.items[*].id') AS item_ids FROM participants WHERE study_id = ? AND participant_id = ?";
// The version's real-rewards setting rides along (it can change at any time, so it is read, not cached).
const SELECT_ANSWERS = 'SELECT item_id, chosen, EXISTS (SELECT 1 FROM reward_settings WHERE design_version_id = ? AND enabled) AS rewards FROM stage2_answers WHERE participant_ref = ?';
// The session row reaches at least 'served'; 'completed' sticks once reached, whichever request finishes last.
// A participant served through a key or the session page has the row already: it is updated in place
// (UPDATE_SESSION). Only when that changes nothing (no row yet, e.g. a participant served in a batch,
// or nothing new to write) does UPSERT_SESSION follow, in a round trip of its own; it writes only while
// the participant is on record (its row read by id, in the same statement).
const SESSION_STATUS = "IF(status = 'completed' OR ? = 'completed', 'completed', 'served')";
const UPDATE_SESSION = `UPDATE participant_sessions
  SET status = ${SESSION_STATUS}, served_at = COALESCE(served_at, ?), completed_at = COALESCE(completed_at, ?), last_activity_at = ?
  WHERE study_id = ? AND participant_id = ?`;
const UPSERT_SESSION = `INSERT INTO participant_sessions
  (study_id, design_version_id, participant_id, status, source, api_key_id, started_at, served_at, completed_at, last_activity_at)
  SELECT ?, ?, ?, ?, ?, ?, ?, ?, ?, ? FROM participants WHERE id = ?
  ON DUPLICATE KEY UPDATE
    status = IF(status = 'completed' OR VALUES(status) = 'completed', 'completed', 'served'),
    served_at = COALESCE(served_at, VALUES(served_at)),
    completed_at = COALESCE(completed_at, VALUES(completed_at)),
    last_activity_at = VALUES(last_activity_at)`;

/**
 * Remembers what was just served to a participant (the row's id, version and stage-2 item ids in
 * presentation order), so their first stage-2 answers need not read it back.
 */
export function rememberServedParticipant(studyId: number, participantId: string, served: ServedParticipant): void {
  if (servedCache.size >= SERVED_CACHE_LIMIT) servedCache.clear();
  servedCache.set(`${studyId}:${participantId}`, served);
}

async function servedParticipant(studyId: number, participantId: string): Promise<ServedParticipant | null> {
  const cacheKey = `${studyId}:${participantId}`;
  const hit = servedCache.get(cacheKey);
  if (hit) return hit;
  const [row] = await rawQuery(SELECT_SERVED, [studyId, participantId]);
  if (!row) return null;
  const raw = row.item_ids;
  const itemIds = (decodeJson(raw) ?? []) as string[];
  const served = { ref: Number(row.id), designVersionId: Number(row.design_version_id), itemIds };
  rememberServedParticipant(studyId, participantId, served);
  return served;
}

/**
 * Records a participant's answers to their served stage-2 items: the one writer of
 * `stage2_answers` (session API, session page, CSV upload).
 *
 * - 422 when the participant has not been served stage-2 items (answers before calibration), for
 *   items that were not served to them, and for one item answered twice differently in one call;
 *   every problem is named at once and nothing is written.
 * - Idempotent: an answer already recorded with the same choice is not an error and writes nothing.
 * - 409 when an item already has a different answer: the first answer stays. Other, new answers
 *   of the same call are kept (a block may be sent in parts, and a retry of the same call gives
 *   the same 409), and the error names the changed items.
 * - Partial calls are allowed; the session reads `completed` once every served item is answered.
 *
 * Concurrency rests on UNIQUE (participant_ref, item_id): the insert skips rows that exist, and
 * the read-back compares what is stored with what was sent (no application locks).
 */
export async function recordStage2Answers(input: RecordAnswersInput): Promise<RecordAnswersResult> {
  const served = await servedParticipant(input.studyId, input.participantId);
  if (!served) {
    throw new ValidationError(
      [{ path: 'participantId', message: `Participant ${input.participantId} has not been served stage-2 items yet: send their calibration answers first.` }],
      'Stage-2 answers arrived before the calibration answers.',
    );
  }
  if (input.designVersionId !== undefined && served.designVersionId !== input.designVersionId) {
    throw new ConflictError(`Participant ${input.participantId} was served with another design version; answers are recorded only through that version.`);
  }
  const known = new Set(served.itemIds);
  const issues: Array<{ path: string; message: string }> = [];
  const byItem = new Map<string, Stage2AnswerInput>();
  input.answers.forEach((answer, index) => {
    if (!known.has(answer.itemId)) issues.push({ path: `answers.${index}.itemId`, message: `${answer.itemId} was not served to participant ${input.participantId}.` });
    const earlier = byItem.get(answer.itemId);
    if (earlier && earlier.chosen !== answer.chosen) issues.push({ path: `answers.${index}.chosen`, message: `${answer.itemId} is answered twice, differently, in this request.` });
    byItem.set(answer.itemId, answer);
  });
  if (issues.length) throw new ValidationError(issues, 'Some stage-2 answers are not for items served to this participant.');

  const now = new Date();
  const at = sqlDate(now);
  // Sorted by item id, so parallel calls lock index entries in one order.
  const rows = [...byItem.values()].sort((a, b) => (a.itemId < b.itemId ? -1 : a.itemId > b.itemId ? 1 : 0));
  // One round trip: the insert, the read-back of what is stored, and the session row. A request that
  // answers every served item completes the block whatever was stored before; any other is recorded as
  // served, and marked completed by a second statement when the read-back shows the block complete.
  const sessionUpdate = (status: 'served' | 'completed'): RawStatement => [UPDATE_SESSION, [status, at, status === 'completed' ? at : null, at, input.studyId, input.participantId]];
  const sessionUpsert = (status: 'served' | 'completed'): RawStatement => [
    UPSERT_SESSION,
    [input.studyId, served.designVersionId, input.participantId, status, input.source, input.apiKeyId ?? null, at, at, status === 'completed' ? at : null, at, served.ref],
  ];
  /** After `update` (sessionUpdate's outcome): the upsert when the update changed no row. */
  const sessionWritten = async (status: 'served' | 'completed', update: RawResult): Promise<void> => {
    if (Number(update.affectedRows ?? 0) === 0) await rawExecute(...sessionUpsert(status));
  };
  const completesBlock = served.itemIds.every((id) => byItem.has(id));
  const statements: RawStatement[] = [];
  if (rows.length) {
    const values: unknown[] = [];
    for (const a of rows) values.push(input.studyId, served.ref, a.itemId, a.chosen, a.responseMs ?? null, a.sideShown ?? null, input.source, input.apiKeyId ?? null, input.recordedBy ?? null, at);
    const placeholders = rows.map(() => '(?, ?, ?, ?, ?, ?, ?, ?, ?, ?)').join(', ');
    statements.push([
      `INSERT IGNORE INTO stage2_answers (study_id, participant_ref, item_id, chosen, response_ms, side_shown, source, api_key_id, recorded_by, created_at) VALUES ${placeholders}`,
      values,
    ]);
  }
  const firstStatus = completesBlock ? 'completed' : 'served';
  statements.push([SELECT_ANSWERS, [served.designVersionId, served.ref]], sessionUpdate(firstStatus));
  const outcomes = await rawPipeline(statements);
  const recorded = rows.length ? Number(settled(outcomes[0]).affectedRows ?? 0) : 0;
  const storedRows = settled(outcomes[outcomes.length - 2]);
  const stored = new Map(storedRows.map((r) => [String(r.item_id), String(r.chosen)]));
  if (rows.some((a) => !stored.has(a.itemId))) {
    // IGNORE also skips a row whose participant vanished (its study was deleted) after it was cached.
    servedCache.delete(`${input.studyId}:${input.participantId}`);
    throw new ValidationError([{ path: 'participantId', message: `Participant ${input.participantId} is no longer on record.` }], 'Stage-2 answers arrived for an unknown participant.');
  }
  await sessionWritten(firstStatus, settled(outcomes[outcomes.length - 1]));
  const changed = rows.filter((a) => stored.get(a.itemId) !== a.chosen);
  const unanswered = served.itemIds.filter((id) => !stored.has(id));
  const status = unanswered.length === 0 ? 'completed' : 'served';
  if (status === 'completed' && !completesBlock) await sessionWritten('completed', await rawExecute(...sessionUpdate('completed')));
  if (changed.length) {
    throw new ConflictError(
      `Participant ${input.participantId} already answered ${changed.map((a) => a.itemId).join(', ')} differently; the first answers stay.` +
        (recorded ? ` The ${recorded} new answer(s) of this request were recorded.` : ''),
    );
  }
  const result: RecordAnswersResult = { participantId: input.participantId, recorded, answered: stored.size, itemCount: served.itemIds.length, status, unanswered };
  // Real rewards: the paid choice is drawn when the session completes (once; a replay reads it back).
  // Uploaded answers record sessions run elsewhere and draw nothing.
  if (status === 'completed' && input.source !== 'upload') {
    // Whether the version pays real rewards was read with the answers (no stored answer: ask).
    const rewardsEnabled = storedRows.length ? Number(storedRows[0].rewards) === 1 : undefined;
    const reward = await drawPayoutOnCompletion({ studyId: input.studyId, participantId: input.participantId, designVersionId: served.designVersionId, rewardsEnabled });
    if (reward) result.reward = reward;
  }
  return result;
}

/** Forgets the cached served participants (tests that delete rows under a running process). */
export function forgetServedParticipants(): void {
  servedCache.clear();
}
