import { QueryTypes } from 'sequelize';
import { db } from '@/db';
import { Study } from '@/db/models';
import type { StoredSessionStatus } from '@/db/models/session';
import { personRecordsCsv } from '@/lib/shared/csv';
import { NotFoundError } from '@/lib/server/errors';
import { recordAudit } from './audit';

/** A session's status as shown and exported: the furthest step reached, or abandoned. */
export type SessionStatus = StoredSessionStatus | 'abandoned';
export const SESSION_STATUSES: readonly SessionStatus[] = ['started', 'calibrated', 'served', 'completed', 'abandoned'];

/**
 * The status of one session. A participant with a `participants` row is at least `served`
 * (a batch upload writes no session row); a session that is not completed and has had no
 * activity for `idleMinutes` is `abandoned`.
 *
 * @example sessionState({ stored: 'started', served: false, lastActivityAt: new Date(0), idleMinutes: 60, now: new Date(3_600_001) }) === 'abandoned'
 */
export function sessionState(input: { stored: StoredSessionStatus | null; served: boolean; lastActivityAt: Date; idleMinutes: number; now: Date }): SessionStatus {
  let status: StoredSessionStatus = input.stored ?? 'served';
  if (input.served && (status === 'started' || status === 'calibrated')) status = 'served';
  if (status !== 'completed' && input.now.getTime() - input.lastActivityAt.getTime() > input.idleMinutes * 60_000) return 'abandoned';
  return status;
}

/** One participant's session as the participants page lists it and the export writes it. */
export type SessionStatusRow = {
  participantId: string;
  designVersionId: number;
  status: SessionStatus;
  source: string;
  startedAt: string;
  servedAt: string | null;
  completedAt: string | null;
  lastActivityAt: string;
  /** stage-2 items answered / served (0 / 0 before serving) */
  answered: number;
  itemCount: number;
};

type Raw = {
  participant_id: string;
  design_version_id: number;
  stored: StoredSessionStatus | null;
  served: number;
  source: string;
  started_at: Date;
  served_at: Date | null;
  completed_at: Date | null;
  last_activity_at: Date;
  answered: number;
  item_count: number | null;
};

// Sessions Switchback tracks (with their participants row when served), then participants served
// through the API or a batch without a session row yet.
const SESSIONS_SQL = `
  SELECT s.participant_id, s.design_version_id, s.status AS stored, p.id IS NOT NULL AS served, s.source,
         s.started_at, COALESCE(s.served_at, p.created_at) AS served_at, s.completed_at,
         GREATEST(s.last_activity_at, COALESCE(p.created_at, s.last_activity_at)) AS last_activity_at,
         (SELECT COUNT(*) FROM stage2_answers a WHERE a.participant_ref = p.id) AS answered,
         JSON_LENGTH(p.result, '$.items') AS item_count
    FROM participant_sessions s
    LEFT JOIN participants p ON p.study_id = s.study_id AND p.participant_id = s.participant_id
   WHERE s.study_id = :studyId /*session-filters*/
  UNION ALL
  SELECT p.participant_id, p.design_version_id, NULL, 1, p.source,
         p.created_at, p.created_at, NULL, p.created_at,
         0, JSON_LENGTH(p.result, '$.items')
    FROM participants p
    LEFT JOIN participant_sessions s ON s.study_id = p.study_id AND s.participant_id = p.participant_id
   WHERE p.study_id = :studyId AND s.id IS NULL /*participant-filters*/`;

/** Which sessions a list reads: part of a participant id (any letter case), one frozen version. */
export type SessionFilter = { search?: string; versionId?: number };

// Ids keep their exact (binary) collation for identity; a search compares them case-insensitively.
function filteredSql(filter: SessionFilter): string {
  const conditions = (alias: string) =>
    [
      filter.search ? ` AND ${alias}.participant_id COLLATE utf8mb4_unicode_ci LIKE :like ESCAPE '!'` : '',
      filter.versionId !== undefined ? ` AND ${alias}.design_version_id = :versionId` : '',
    ].join('');
  return SESSIONS_SQL.replace('/*session-filters*/', conditions('s')).replace('/*participant-filters*/', conditions('p'));
}

/** A LIKE pattern matching `text` anywhere, its own wildcards taken literally. */
function containsPattern(text: string): string {
  return `%${text.replace(/[!%_]/g, (c) => `!${c}`)}%`;
}

const iso = (d: Date | string | null) => (d === null ? null : new Date(d).toISOString());

/** Every session of a study with its status (abandoned after the study's idle time), most recent activity first. */
export async function listSessionStatuses(studyId: number, options: { idleMinutes: number; now?: Date } & SessionFilter): Promise<SessionStatusRow[]> {
  const now = options.now ?? new Date();
  const rows = await db().query<Raw>(filteredSql(options), {
    replacements: { studyId, like: containsPattern(options.search ?? ''), versionId: options.versionId ?? 0 },
    type: QueryTypes.SELECT,
  });
  return rows
    .map((r) => {
      const lastActivityAt = new Date(r.last_activity_at);
      return {
        participantId: r.participant_id,
        designVersionId: Number(r.design_version_id),
        status: sessionState({ stored: r.stored, served: Number(r.served) === 1, lastActivityAt, idleMinutes: options.idleMinutes, now }),
        source: r.source,
        startedAt: iso(r.started_at)!,
        servedAt: iso(r.served_at),
        completedAt: iso(r.completed_at),
        lastActivityAt: lastActivityAt.toISOString(),
        answered: Number(r.answered),
        itemCount: Number(r.item_count ?? 0),
      };
    })
    .sort((a, b) => (a.lastActivityAt < b.lastActivityAt ? 1 : a.lastActivityAt > b.lastActivityAt ? -1 : a.participantId < b.participantId ? -1 : a.participantId > b.participantId ? 1 : 0));
}

/** How many sessions are in each status. */
export function countByStatus(rows: readonly { status: SessionStatus }[]): Record<SessionStatus, number> {
  const counts = Object.fromEntries(SESSION_STATUSES.map((s) => [s, 0])) as Record<SessionStatus, number>;
  for (const r of rows) counts[r.status] += 1;
  return counts;
}

/** Sessions as CSV (one row per participant), every cell through the formula guard, the caution in the last column. */
export function sessionsCsv(rows: readonly SessionStatusRow[]): string {
  const columns = ['participantId', 'status', 'answered', 'itemCount', 'source', 'designVersionId', 'startedAt', 'servedAt', 'completedAt', 'lastActivityAt'];
  return personRecordsCsv({ records: rows, columns });
}

/**
 * The study's sessions matching a search and version, with counts per status among them, then
 * only one status if asked (the counts say what each status filter would show).
 */
export async function studySessions(study: { id: number; sessionIdleMinutes: number }, filter: SessionFilter & { status?: SessionStatus | null; now?: Date } = {}) {
  const all = await listSessionStatuses(study.id, { idleMinutes: study.sessionIdleMinutes, search: filter.search, versionId: filter.versionId, now: filter.now });
  return { idleMinutes: study.sessionIdleMinutes, counts: countByStatus(all), sessions: filter.status ? all.filter((r) => r.status === filter.status) : all };
}

/** Sets after how many idle minutes an unfinished session reads as abandoned (audited). */
export async function setSessionIdleMinutes(actorId: number, studyId: number, minutes: number) {
  const sequelize = db();
  return sequelize.transaction(async (transaction) => {
    const study = await Study.findByPk(studyId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!study) throw new NotFoundError('Study not found.');
    const before = study.sessionIdleMinutes;
    await study.update({ sessionIdleMinutes: minutes }, { transaction });
    await recordAudit({ actorId, studyId, action: 'sessions.idle-time', details: { from: before, to: minutes } }, transaction);
    return { idleMinutes: minutes };
  });
}
