import { Participant } from '@/db/models';
import { rawPipeline, rawQuery, settled, sqlDate } from '@/db';
import { ConflictError, ValidationError } from '@/lib/server/errors';
import { contentHash } from '@/lib/shared/canonical-json';
import { ItemBankInputError, serveParticipant, type ServedItems } from '@/lib/design';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import { markApiKeyRevoked, RevokedKeyError, type CachedKey } from './api-keys';
import { bankOrInvalid } from './item-bank';
import { servedSessionAfterInsert, servedSessionOnReplay } from './session-tokens';
import { rememberServedParticipant } from './stage2-answers';

/** Who serves: a key (the probe-items API), an operator (a batch), or a participant on the session page. */
export type ServeSource = { source: 'api'; key: CachedKey } | { source: 'batch'; userId: number } | { source: 'page' };

/** The reply of the probe-items API and what a participant record keeps. */
export type ProbeItemsReply = ServedItems & { designHash: string; servedAt: string };

/** What serving needs of a frozen design version. */
export type ServedVersion = { id: number; studyId: number; hash: string; content: FrozenDesign };

const COLUMNS = 'study_id, design_version_id, participant_id, responses_hash, responses, result, flag, source, api_key_id, served_by, created_at';
// The key's revoked state is read by the insert itself: one statement, and a key revoked
// through another process (whose cache still holds it) records nobody.
const INSERT_VIA_KEY = `INSERT INTO participants (${COLUMNS}) SELECT ?, ?, ?, ?, ?, ?, ?, 'api', id, NULL, ? FROM api_keys WHERE id = ? AND revoked_at IS NULL`;
const INSERT_BY_USER = `INSERT INTO participants (${COLUMNS}) VALUES (?, ?, ?, ?, ?, ?, ?, 'batch', NULL, ?, ?)`;
const INSERT_BY_PAGE = `INSERT INTO participants (${COLUMNS}) VALUES (?, ?, ?, ?, ?, ?, ?, 'page', NULL, NULL, ?)`;
const READ_BACK = 'SELECT responses_hash, design_version_id, result FROM participants WHERE study_id = ? AND participant_id = ?';
const ER_DUP_ENTRY = 1062;

/**
 * Personalised probe items for one participant, recorded once; the reply as the JSON text that
 * is stored and sent (the API answers it as is, a batch parses it).
 * Idempotent: the same participant with the same responses gets the stored reply; different
 * responses for a participant already served → 409 and nothing changes. Concurrency relies on
 * the UNIQUE (study_id, participant_id) index: the insert is tried first, and a request that
 * loses the race reads the winner's record back (no application locks).
 * Served through a key, the participant's session row reaches `served` as well (servedSessionAfterInsert).
 */
export async function serveProbeItemsJson(
  version: ServedVersion,
  participantId: string,
  responses: Record<string, string>,
  by: ServeSource,
  presentation: { seed?: number; delayUnit?: 'days' | 'weeks' | 'months'; minGap?: number } = {},
): Promise<string> {
  const { bank, locate } = bankOrInvalid(version, presentation);
  let served: ServedItems;
  try {
    served = serveParticipant(version.content, bank, { participantId, responses, locate });
  } catch (error) {
    if (error instanceof ItemBankInputError) throw new ValidationError(error.issues, 'Some calibration responses are invalid.');
    throw error;
  }
  const responsesHash = contentHash(responses);
  const servedAt = new Date();
  // Object.assign, not a spread plus fields: the latter is slow in Node 20's V8 (see pairItems).
  const reply: ProbeItemsReply = Object.assign({}, served, { designHash: version.hash, servedAt: servedAt.toISOString() });
  const json = JSON.stringify(reply);
  const row = [version.studyId, version.id, participantId, responsesHash, JSON.stringify(responses), json, served.flag];
  const at = sqlDate(servedAt);
  try {
    // Plain single statements on the driver: the probe API's hot path, where a model instance
    // or Sequelize's escaping of the 4 kB reply costs more than the query.
    let result;
    if (by.source === 'api') {
      // The session row goes in the same round trip, written only if the insert recorded the participant.
      const [inserted, session] = await rawPipeline([[INSERT_VIA_KEY, [...row, at, by.key.id]], servedSessionAfterInsert(by.key, version.id, participantId, at)]);
      result = settled(inserted);
      if (result.affectedRows === 0) {
        // revoked (or deleted with its study) after this process cached it
        markApiKeyRevoked(by.key);
        throw new RevokedKeyError(by.key);
      }
      settled(session);
    } else {
      result = by.source === 'batch' ? await rawQuery(INSERT_BY_USER, [...row, by.userId, at]) : await rawQuery(INSERT_BY_PAGE, [...row, at]);
    }
    rememberServedParticipant(version.studyId, participantId, { ref: Number(result.insertId), designVersionId: version.id, itemIds: served.items.map((i) => i.id) });
    return json;
  } catch (error) {
    if ((error as { errno?: number }).errno !== ER_DUP_ENTRY) throw error;
  }
  // A replay through a key records its session activity in the round trip of the read-back.
  const [back, session] =
    by.source === 'api'
      ? await rawPipeline([[READ_BACK, [version.studyId, participantId]], servedSessionOnReplay(by.key, version.id, participantId, responsesHash, at)])
      : [{ status: 'fulfilled' as const, value: await rawQuery(READ_BACK, [version.studyId, participantId]) }, null];
  const [existing] = settled(back);
  if (!existing) throw new ConflictError('This participant is being served right now; try again.');
  if (existing.responses_hash !== responsesHash || Number(existing.design_version_id) !== version.id) {
    throw new ConflictError(`Participant ${participantId} was already served with different calibration responses (or another design version); their items stay as served.`);
  }
  if (session) settled(session);
  return typeof existing.result === 'string' ? existing.result : JSON.stringify(existing.result);
}

/** serveProbeItemsJson's reply as an object (batch mode). */
export async function serveProbeItems(version: ServedVersion, participantId: string, responses: Record<string, string>, by: ServeSource): Promise<ProbeItemsReply> {
  return JSON.parse(await serveProbeItemsJson(version, participantId, responses, by)) as ProbeItemsReply;
}

/** A participant row as the study's participants page lists it. */
export function participantJson(p: Participant) {
  const result = p.result as unknown as ProbeItemsReply;
  return {
    id: p.id,
    participantId: p.participantId,
    designVersionId: p.designVersionId,
    source: p.source,
    flag: p.flag,
    itemSet: result.itemSet,
    kSmall: result.estimates.kSmall,
    kLarge: result.estimates.kLarge,
    extrapolation: result.extrapolation?.message ?? null,
    attentionCheck: result.attentionCheck,
    items: result.items,
    servedAt: p.createdAt.toISOString(),
  };
}
