import { createHash, randomBytes } from 'node:crypto';
import { rawQuery, type RawStatement } from '@/db';
import { ConflictError, ForbiddenError } from '@/lib/server/errors';
import type { CachedKey } from './api-keys';
import type { FrozenVersionRef } from './item-bank';

// Participant sessions started through the session API, and the token that binds a browser key's
// calls to one participant (only its SHA-256 is stored, in participant_sessions.token_hash).

function tokenHash(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

const SELECT_SESSION = 'SELECT token_hash, status FROM participant_sessions WHERE study_id = ? AND participant_id = ?';

/**
 * A browser key acts for one participant only with that participant's session token (handed out
 * when their session started): 403 otherwise, so a key copied from a public page can neither act
 * as nor read another participant. Server keys are trusted with every participant of their study.
 */
export async function requireParticipantToken(key: CachedKey, participantId: string, token: string | null): Promise<void> {
  if (key.kind !== 'browser') return;
  const [row] = await rawQuery(SELECT_SESSION, [key.studyId, participantId]);
  if (!token || !row || typeof row.token_hash !== 'string' || row.token_hash !== tokenHash(token)) {
    throw new ForbiddenError(`Send participant ${participantId}'s session token (X-Session-Token, from the calibration reply that started the session).`);
  }
}

const START_SESSION = `INSERT IGNORE INTO participant_sessions
  (study_id, design_version_id, participant_id, status, source, api_key_id, started_at, last_activity_at, token_hash)
  VALUES (?, ?, ?, 'started', 'api', ?, ?, ?, ?)`;
const TOUCH_SESSION = 'UPDATE participant_sessions SET last_activity_at = ? WHERE study_id = ? AND participant_id = ?';

/**
 * Starts (or resumes) a participant's session when the calibration block is fetched for them.
 * Server key: the row is created once, without a token. Browser key: a new session gets a token
 * (returned once); a session that exists is resumed only with its token, else 409.
 */
export async function startSession(key: CachedKey, version: FrozenVersionRef, participantId: string, token: string | null): Promise<{ sessionToken: string | null }> {
  const now = new Date();
  if (key.kind === 'browser' && token) {
    await requireParticipantToken(key, participantId, token);
    await rawQuery(TOUCH_SESSION, [now, key.studyId, participantId]);
    return { sessionToken: null };
  }
  const fresh = key.kind === 'browser' ? randomBytes(24).toString('base64url') : null;
  const result = await rawQuery(START_SESSION, [key.studyId, version.id, participantId, key.id, now, now, fresh ? tokenHash(fresh) : null]);
  if (Number(result.affectedRows ?? 0) === 1) return { sessionToken: fresh };
  if (key.kind === 'browser') {
    throw new ConflictError(`Participant ${participantId}'s session has already started; resume it with its session token (X-Session-Token).`);
  }
  await rawQuery(TOUCH_SESSION, [now, key.studyId, participantId]);
  return { sessionToken: null };
}

// The session row of a participant served through the probe-items API: created (or moved on to
// 'served') when their calibration answers are scored, so the participants page and the session
// page's counts see them from then on, not only after their first stage-2 answer.
const SERVED_SESSION_COLUMNS = '(study_id, design_version_id, participant_id, status, source, api_key_id, started_at, calibrated_at, served_at, last_activity_at)';
const SERVED_SESSION_UPDATE = `ON DUPLICATE KEY UPDATE
    status = IF(status IN ('started', 'calibrated'), 'served', status),
    calibrated_at = COALESCE(calibrated_at, VALUES(calibrated_at)),
    served_at = COALESCE(served_at, VALUES(served_at)),
    last_activity_at = VALUES(last_activity_at)`;
// Sent right behind the insert of the participant on the same connection (rawPipeline): it writes
// only when that insert recorded them (ROW_COUNT() is 1; 0 for a revoked key, -1 when they were
// already served). No subquery here: the optimiser would run it for every new participant.
const SERVED_SESSION_AFTER_INSERT = `INSERT INTO participant_sessions ${SERVED_SESSION_COLUMNS}
  SELECT ?, ?, ?, 'served', 'api', ?, ?, ?, ?, ? FROM DUAL WHERE ROW_COUNT() = 1
  ${SERVED_SESSION_UPDATE}`;
// A replay (the insert found them already served): written only when they were served with these
// very answers through this version, which counts as activity; never for a 409.
const SERVED_SESSION_ON_REPLAY = `INSERT INTO participant_sessions ${SERVED_SESSION_COLUMNS}
  SELECT ?, ?, ?, 'served', 'api', ?, ?, ?, ?, ? FROM participants
  WHERE study_id = ? AND participant_id = ? AND responses_hash = ? AND design_version_id = ?
  ${SERVED_SESSION_UPDATE}`;

/**
 * The statement that records a key's serving of a participant in their session row (status at
 * least `served`), to be sent right behind the statement that inserts their `participants` row
 * (one round trip for both). `at` is the serving time as UTC DATETIME text.
 */
export function servedSessionAfterInsert(key: CachedKey, versionId: number, participantId: string, at: string): RawStatement {
  return [SERVED_SESSION_AFTER_INSERT, [key.studyId, versionId, participantId, key.id, at, at, at, at]];
}

/** The same for a replay, sent with the read-back of the participant: writes only if they were served with `responsesHash` through `versionId`. */
export function servedSessionOnReplay(key: CachedKey, versionId: number, participantId: string, responsesHash: string, at: string): RawStatement {
  return [SERVED_SESSION_ON_REPLAY, [key.studyId, versionId, participantId, key.id, at, at, at, at, key.studyId, participantId, responsesHash, versionId]];
}
