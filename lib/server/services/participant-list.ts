import { Op } from 'sequelize';
import { db } from '@/db';
import { Participant } from '@/db/models';
import { PERSON_CAUTION } from '@/lib/shared/cautions';
import { personRecordsCsv } from '@/lib/shared/csv';
import type { ParticipantsQuery } from '@/lib/shared/validations/session';
import { participantJson } from './participants';
import { studySessions, type SessionStatusRow } from './session-status';

/** One participant as the participants list shows them: the session, and what they were served (null before serving). */
export type ParticipantListRow = SessionStatusRow & { served: ReturnType<typeof participantJson> | null };

type StudyRef = { id: number; sessionIdleMinutes: number };
type Filters = Pick<ParticipantsQuery, 'q' | 'status' | 'version'>;

/** The sessions a filter selects, with counts per status among those matching the search and version. */
async function matching(study: StudyRef, filters: Filters, now?: Date) {
  return studySessions(study, { search: filters.q || undefined, versionId: filters.version, status: filters.status ?? null, now });
}

/** The served records of these participants, by participant id. */
async function servedOf(studyId: number, participantIds: string[]) {
  if (participantIds.length === 0) return new Map<string, ReturnType<typeof participantJson>>();
  db();
  const rows = await Participant.findAll({ where: { studyId, participantId: { [Op.in]: participantIds } } });
  return new Map(rows.map((p) => [p.participantId, participantJson(p)]));
}

/**
 * One page of a study's participants, most recent activity first: those whose id contains `q`
 * (any letter case), of one frozen version and one session status if asked. `counts` are per
 * status among the participants matching the search and version, so each status filter shows its
 * number before it is chosen. A page past the last is read as the last.
 */
export async function listStudyParticipants(study: StudyRef, query: Filters & { page: number; pageSize: number }, now?: Date) {
  const { counts, sessions, idleMinutes } = await matching(study, query, now);
  const total = sessions.length;
  const pageCount = Math.max(1, Math.ceil(total / query.pageSize));
  const page = Math.min(query.page, pageCount);
  const slice = sessions.slice((page - 1) * query.pageSize, page * query.pageSize);
  const served = await servedOf(study.id, slice.map((s) => s.participantId));
  const participants: ParticipantListRow[] = slice.map((s) => ({ ...s, served: served.get(s.participantId) ?? null }));
  return { total, page, pageSize: query.pageSize, pageCount, counts, idleMinutes, participants, caution: PERSON_CAUTION };
}

/**
 * Every participant a filter selects (all pages) as CSV: one row per stage-2 item served with the
 * person's status and estimates, one row without item columns for a participant not yet served;
 * every cell through the formula guard, the caution in its last column.
 */
export async function filteredParticipantsCsv(study: StudyRef, filters: Filters, now?: Date): Promise<string> {
  const { sessions } = await matching(study, filters, now);
  const served = await servedOf(study.id, sessions.map((s) => s.participantId));
  const rows = sessions.flatMap((s) => {
    const p = served.get(s.participantId);
    const person = {
      participantId: s.participantId,
      status: s.status,
      answered: s.answered,
      designVersionId: s.designVersionId,
      source: s.source,
      startedAt: s.startedAt,
      servedAt: p?.servedAt ?? s.servedAt ?? '',
      lastActivityAt: s.lastActivityAt,
      itemSet: p?.itemSet ?? '',
      flag: p?.flag ?? '',
      kSmall: p?.kSmall.rate ?? '',
      kSmallSeLog: p?.kSmall.standardErrorLog ?? '',
      kLarge: p?.kLarge.rate ?? '',
      kLargeSeLog: p?.kLarge.standardErrorLog ?? '',
      attentionCheck: p?.attentionCheck ?? '',
      extrapolation: p?.extrapolation ?? '',
    };
    return p && p.items.length ? p.items.map((item) => ({ ...person, ...item })) : [person];
  });
  return personRecordsCsv({ records: rows, columns: rows.length ? undefined : PERSON_COLUMNS });
}

/** The columns of a participant before their items' own (all a file with nobody in it has). */
const PERSON_COLUMNS = ['participantId', 'status', 'answered', 'designVersionId', 'source', 'startedAt', 'servedAt', 'lastActivityAt', 'itemSet', 'flag', 'kSmall', 'kSmallSeLog', 'kLarge', 'kLargeSeLog', 'attentionCheck', 'extrapolation'];
