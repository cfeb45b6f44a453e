import { QueryTypes } from 'sequelize';
import { db } from '@/db';
import { Study } from '@/db/models';
import type { StoredSessionStatus } from '@/db/models/session';
import { toCsv } from '@/lib/shared/csv';
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
   WHERE s.study_id = :studyId
  UNION ALL
  SELECT p.participant_id, p.design_version_id, NULL, 1, p.source,
         p.created_at, p.created_at, NULL, p.created_at,
         0, JSON_LENGTH(p.result, '$.items')
    FROM participants p
    LEFT JOIN participant_sessions s ON s.study_id = p.study_id AND s.participant_id = p.participant_id
   WHERE p.study_id = :studyId AND s.id IS NULL`;

const iso = (d: Date | string | null) => (d === null ? null : new Date(d).toISOString());

/** Every session of a study with its status (abandoned after the study's idle time), most recent activity first. */
export async function listSessionStatuses(studyId: number, options: { idleMinutes: number; now?: Date }): Promise<SessionStatusRow[]> {
  const now = options.now ?? new Date();
  const rows = await db().query<Raw>(SESSIONS_SQL, { replacements: { studyId }, type: QueryTypes.SELECT });
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
    .sort((a, b) => (a.lastActivityAt < b.lastActivityAt ? 1 : a.lastActivityAt > b.lastActivityAt ? -1 : 0));
}

/** How many sessions are in each status. */
export function countByStatus(rows: readonly { status: SessionStatus }[]): Record<SessionStatus, number> {
  const counts = Object.fromEntries(SESSION_STATUSES.map((s) => [s, 0])) as Record<SessionStatus, number>;
  for (const r of rows) counts[r.status] += 1;
  return counts;
}

/** Sessions as CSV (one row per participant), every cell through the formula guard. */
export function sessionsCsv(rows: readonly SessionStatusRow[]): string {
  const header = ['participantId', 'status', 'answered', 'itemCount', 'source', 'designVersionId', 'startedAt', 'servedAt', 'completedAt', 'lastActivityAt'];
  return toCsv({ columns: header, rows: rows.map((r) => [r.participantId, r.status, r.answered, r.itemCount, r.source, r.designVersionId, r.startedAt, r.servedAt, r.completedAt, r.lastActivityAt]) });
}

/** The study's sessions with counts per status, optionally only one status. */
export async function studySessions(study: { id: number; sessionIdleMinutes: number }, filter: SessionStatus | null) {
  const all = await listSessionStatuses(study.id, { idleMinutes: study.sessionIdleMinutes });
  return { idleMinutes: study.sessionIdleMinutes, counts: countByStatus(all), sessions: filter ? all.filter((r) => r.status === filter) : all };
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
