import { QueryTypes } from 'sequelize';
import { db } from '@/db';
import { decodeJson } from '@/db/json';
import { toSafeCsv } from '@/lib/shared/csv/formula-guard';
import { recordAudit } from './audit';

/** One audit event as the audit page and its CSV show it. */
export type AuditEventDto = {
  id: number;
  at: string;
  action: string;
  actorId: number | null;
  actorName: string | null;
  actorEmail: string | null;
  details: Record<string, unknown>;
};

export const AUDIT_LIST_LIMIT = 5000;

/** A study's audit events, newest first (at most AUDIT_LIST_LIMIT). Actors who left keep their name. */
export async function listAuditEvents(studyId: number, limit = AUDIT_LIST_LIMIT): Promise<AuditEventDto[]> {
  const rows = await db().query<{ id: number; created_at: Date; action: string; actor_id: number | null; name: string | null; email: string | null; details: unknown }>(
    `SELECT a.id, a.created_at, a.action, a.actor_id, u.name, u.email, a.details
       FROM audit_events a LEFT JOIN users u ON u.id = a.actor_id
      WHERE a.study_id = :studyId
      ORDER BY a.created_at DESC, a.id DESC
      LIMIT :limit`,
    { replacements: { studyId, limit }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    id: r.id,
    at: new Date(r.created_at).toISOString(),
    action: r.action,
    actorId: r.actor_id,
    actorName: r.name,
    actorEmail: r.email,
    details: decodeJson(r.details) as Record<string, unknown>,
  }));
}

/** Details as "key=value; key=value" for a table cell or a CSV column. */
export function describeDetails(details: Record<string, unknown>): string {
  return Object.entries(details)
    .map(([key, value]) => `${key}=${typeof value === 'string' ? value : JSON.stringify(value)}`)
    .join('; ');
}

/**
 * The audit trail of a study as CSV (safe against spreadsheet formulas). The export itself is
 * recorded as an event, after the rows are read, so it appears in the next export.
 */
export async function exportAuditCsv(actorId: number, studyId: number): Promise<string> {
  const events = await listAuditEvents(studyId);
  await recordAudit({ actorId, studyId, action: 'audit.export', details: { rows: events.length } });
  return toSafeCsv(
    ['time_utc', 'action', 'actor_name', 'actor_email', 'details'],
    events.map((e) => [e.at, e.action, e.actorName, e.actorEmail, describeDetails(e.details)]),
  );
}
