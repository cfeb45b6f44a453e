import { QueryTypes } from 'sequelize';
import { db } from '@/db';
import { decodeJson } from '@/db/json';
import { toCsv } from '@/lib/shared/csv';
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

/** Names of the things audit details point to by id, so the audit page can write sentences with names and links. */
export type AuditNamesDto = {
  designs: Record<string, string>;
  versions: Record<string, { designId: number; designName: string; number: number }>;
  priors: Record<string, string>;
  users: Record<string, string>;
};

/** The current names of the study's designs, frozen versions, prior sets and of the people its events mention. */
export async function listAuditNames(studyId: number): Promise<AuditNamesDto> {
  const q = <T extends object>(sql: string) => db().query<T>(sql, { replacements: { studyId }, type: QueryTypes.SELECT });
  const [designs, versions, priors, users] = await Promise.all([
    q<{ id: number; name: string }>('SELECT id, name FROM designs WHERE study_id = :studyId'),
    q<{ id: number; design_id: number; number: number; name: string }>(
      'SELECT v.id, v.design_id, v.number, d.name FROM design_versions v JOIN designs d ON d.id = v.design_id WHERE v.study_id = :studyId',
    ),
    q<{ id: number; name: string }>('SELECT id, name FROM prior_sets WHERE study_id = :studyId'),
    q<{ id: number; name: string | null; email: string }>(
      'SELECT DISTINCT u.id, u.name, u.email FROM users u JOIN audit_events a ON a.study_id = :studyId AND (a.actor_id = u.id OR JSON_VALUE(a.details, \'$.userId\') = u.id)',
    ),
  ]);
  return {
    designs: Object.fromEntries(designs.map((d) => [String(d.id), d.name])),
    versions: Object.fromEntries(versions.map((v) => [String(v.id), { designId: v.design_id, designName: v.name, number: v.number }])),
    priors: Object.fromEntries(priors.map((p) => [String(p.id), p.name])),
    users: Object.fromEntries(users.map((u) => [String(u.id), u.name || u.email])),
  };
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
  return toCsv({
    columns: ['time_utc', 'action', 'actor_name', 'actor_email', 'details'],
    rows: events.map((e) => [e.at, e.action, e.actorName, e.actorEmail, describeDetails(e.details)]),
  });
}
