import { Parser } from '@json2csv/plainjs';
import { QueryTypes, UniqueConstraintError } from 'sequelize';
import { Participant, type DesignVersion } from '@/db/models';
import { db } from '@/db';
import { ConflictError, ValidationError } from '@/lib/api/errors';
import { contentHash } from '@/lib/canonical-json';
import { neutraliseRows } from '@/lib/csv-safety';
import { ItemBankInputError, serveParticipant, type ServedItems } from '@/lib/design';
import { bankOrInvalid } from './item-bank';

export type ServeSource = { source: 'api'; apiKeyId: number } | { source: 'batch'; userId: number };

/** The reply of the probe-items API and what a participant record keeps. */
export type ProbeItemsReply = ServedItems & { designHash: string; servedAt: string };

/**
 * Personalised probe items for one participant, recorded once.
 * Idempotent: the same participant with the same responses gets the stored reply; different
 * responses for a participant already served → 409 and nothing changes. Concurrency relies on
 * the UNIQUE (study_id, participant_id) index: the insert is tried first, and a request that
 * loses the race reads the winner's record back (no application locks).
 */
export async function serveProbeItems(version: DesignVersion, participantId: string, responses: Record<string, string>, by: ServeSource): Promise<ProbeItemsReply> {
  const { bank, locate } = bankOrInvalid(version);
  let served: ServedItems;
  try {
    served = serveParticipant(version.content, bank, { participantId, responses, locate });
  } catch (error) {
    if (error instanceof ItemBankInputError) throw new ValidationError(error.issues, 'Some calibration responses are invalid.');
    throw error;
  }
  const responsesHash = contentHash(responses);
  const servedAt = new Date();
  const reply: ProbeItemsReply = { ...served, designHash: version.hash, servedAt: servedAt.toISOString() };
  try {
    // A plain INSERT: the probe API's hot path, where building a model instance costs more than the query.
    await db().query(
      `INSERT INTO participants (study_id, design_version_id, participant_id, responses_hash, responses, result, flag, source, api_key_id, served_by, created_at)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      {
        replacements: [
          version.studyId,
          version.id,
          participantId,
          responsesHash,
          JSON.stringify(responses),
          JSON.stringify(reply),
          served.flag,
          by.source,
          by.source === 'api' ? by.apiKeyId : null,
          by.source === 'batch' ? by.userId : null,
          servedAt,
        ],
        type: QueryTypes.INSERT,
      },
    );
    return reply;
  } catch (error) {
    if (!(error instanceof UniqueConstraintError)) throw error;
  }
  const existing = await Participant.findOne({ where: { studyId: version.studyId, participantId } });
  if (!existing) throw new ConflictError('This participant is being served right now; try again.');
  if (existing.responsesHash !== responsesHash || existing.designVersionId !== version.id) {
    throw new ConflictError(`Participant ${participantId} was already served with different calibration responses (or another design version); their items stay as served.`);
  }
  return existing.result as unknown as ProbeItemsReply;
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

/** The study's participants, newest first (at most `limit`). */
export async function listParticipants(studyId: number, limit = 500) {
  db();
  const rows = await Participant.findAll({ where: { studyId }, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit });
  return rows.map(participantJson);
}

/** Participants as CSV: one row per item served, with the participant's estimates; formula-safe. */
export function participantsCsv(participants: ReturnType<typeof participantJson>[]): string {
  const rows = participants.flatMap((p) =>
    p.items.map((item) => ({
      participantId: p.participantId,
      servedAt: p.servedAt,
      source: p.source,
      itemSet: p.itemSet,
      flag: p.flag ?? '',
      kSmall: p.kSmall.rate,
      kSmallSeLog: p.kSmall.standardErrorLog ?? '',
      kLarge: p.kLarge.rate,
      kLargeSeLog: p.kLarge.standardErrorLog ?? '',
      attentionCheck: p.attentionCheck,
      extrapolation: p.extrapolation ?? '',
      ...item,
    })),
  );
  if (rows.length === 0) return 'participantId\n';
  return `${new Parser({ defaultValue: '' }).parse(neutraliseRows(rows))}\n`;
}
