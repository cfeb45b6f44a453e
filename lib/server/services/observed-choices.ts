import { QueryTypes } from 'sequelize';
import { ApiKey, Participant, Stage2Answer } from '@/db/models';
import { db } from '@/db';
import { ApiError, ValidationError } from '@/lib/server/errors';
import { applyExclusions, type ExclusionRules, type ParticipantData } from '@/lib/design';
import { participantData } from '@/lib/shared/results/participant-data';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { listed, parseChoicesCsv, type ChoiceIssue, type ChoiceRow } from '@/lib/shared/results/choices-csv';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import { recordAudit } from './audit';

/** What an upload did: rows read, answers new and already on record, and how the file was read. */
export type UploadReport = {
  rows: number;
  recorded: number;
  alreadyRecorded: number;
  participants: number;
  completedParticipants: number;
  delimiter: ',' | ';' | '\t';
  byteOrderMark: boolean;
  notes: string[];
};

type Served = { ref: number; participantId: string; designVersionId: number; itemIds: Set<string>; itemCount: number };

/**
 * Imports observed stage-2 choices from a long-format CSV (parseChoicesCsv), following the rules
 * of every stage-2 writer (DEVELOPERS.md, "Participant sessions and stage-2 answers"):
 * participants must have been served (unknown participants are refused by line), items must be
 * among the ones served to them, the same answer again is idempotent, and a different answer
 * for a recorded item refuses the whole file with 409 and a report naming each line. Nothing is
 * half-imported: every check runs before the one transaction that inserts the answers, updates
 * the session rows and records the audit event.
 *
 * @throws ValidationError (422) naming line and column; ApiError 409 with the conflicting lines
 */
export async function uploadChoices(studyId: number, actorId: number, text: string): Promise<UploadReport> {
  const parsed = parseChoicesCsv(text);
  if (!parsed.ok) throw new ValidationError(asIssues(parsed.issues), parsed.message);
  const served = await servedParticipants(studyId, [...new Set(parsed.rows.map((r) => r.participant))]);
  const issues: ChoiceIssue[] = [];
  for (const row of parsed.rows) {
    const person = served.get(row.participant);
    if (!person) issues.push({ line: row.line, column: 'participant', message: `Participant "${row.participant.slice(0, 40)}" has not been served stage-2 items in this study.` });
    else if (!person.itemIds.has(row.itemId)) issues.push({ line: row.line, column: 'item', message: `${row.itemId.slice(0, 64)} was not served to participant "${row.participant.slice(0, 40)}".` });
  }
  if (issues.length) {
    const report = listed(issues, 'Nothing was imported.');
    throw new ValidationError(asIssues(report.issues), report.message);
  }
  const refs = [...served.values()].map((p) => p.ref);
  const stored = new Map<string, string>();
  if (refs.length) {
    const rows = await db().query<{ participant_ref: number; item_id: string; chosen: string }>('SELECT participant_ref, item_id, chosen FROM stage2_answers WHERE participant_ref IN (:refs)', {
      replacements: { refs },
      type: QueryTypes.SELECT,
    });
    for (const r of rows) stored.set(`${r.participant_ref}\u0000${r.item_id}`, r.chosen);
  }
  const conflicts: ChoiceIssue[] = [];
  const fresh: Array<ChoiceRow & { ref: number }> = [];
  for (const row of parsed.rows) {
    const ref = served.get(row.participant)!.ref;
    const before = stored.get(`${ref}\u0000${row.itemId}`);
    if (before === undefined) fresh.push({ ...row, ref });
    else if (before !== row.chosen) conflicts.push({ line: row.line, column: 'choice', message: `Participant "${row.participant.slice(0, 40)}" already has ${before} on record for ${row.itemId}; the file says ${row.chosen}.` });
  }
  if (conflicts.length) {
    const report = listed(conflicts, 'Recorded answers are never changed; nothing was imported.');
    throw new ApiError(409, report.message, asIssues(report.issues));
  }
  const now = new Date();
  const touched = [...new Set(parsed.rows.map((r) => r.participant))].map((id) => served.get(id)!);
  let completed = 0;
  await db().transaction(async (transaction) => {
    for (let i = 0; i < fresh.length; i += 500) {
      await Stage2Answer.bulkCreate(
        fresh.slice(i, i + 500).map((r) => ({ studyId, participantRef: r.ref, itemId: r.itemId, chosen: r.chosen, responseMs: r.responseMs, sideShown: null, source: 'upload' as const, apiKeyId: null, recordedBy: actorId, createdAt: now })),
        { transaction },
      );
    }
    const counts = await db().query<{ participant_ref: number; answered: number }>('SELECT participant_ref, COUNT(*) AS answered FROM stage2_answers WHERE participant_ref IN (:refs) GROUP BY participant_ref', {
      replacements: { refs: touched.map((p) => p.ref) },
      type: QueryTypes.SELECT,
      transaction,
    });
    const answered = new Map(counts.map((c) => [Number(c.participant_ref), Number(c.answered)]));
    for (const person of touched) {
      const done = (answered.get(person.ref) ?? 0) >= person.itemCount;
      if (done) completed++;
      await db().query(
        `INSERT INTO participant_sessions (study_id, design_version_id, participant_id, status, source, api_key_id, started_at, served_at, completed_at, last_activity_at)
         VALUES (:studyId, :versionId, :participantId, :status, 'upload', NULL, :now, :now, :completedAt, :now)
         ON DUPLICATE KEY UPDATE
           status = IF(status = 'completed' OR VALUES(status) = 'completed', 'completed', 'served'),
           served_at = COALESCE(served_at, VALUES(served_at)),
           completed_at = COALESCE(completed_at, VALUES(completed_at)),
           last_activity_at = VALUES(last_activity_at)`,
        { replacements: { studyId, versionId: person.designVersionId, participantId: person.participantId, status: done ? 'completed' : 'served', now, completedAt: done ? now : null }, transaction },
      );
    }
    await recordAudit({ actorId, studyId, action: 'stage2.upload', details: { rows: parsed.rows.length, recorded: fresh.length, participants: touched.length } }, transaction);
  });
  return {
    rows: parsed.rows.length,
    recorded: fresh.length,
    alreadyRecorded: parsed.rows.length - fresh.length,
    participants: touched.length,
    completedParticipants: completed,
    delimiter: parsed.delimiter,
    byteOrderMark: parsed.byteOrderMark,
    notes: parsed.notes,
  };
}

function asIssues(issues: ChoiceIssue[]): Array<{ path: string; message: string }> {
  return issues.map((i) => ({ path: `line ${i.line}, ${i.column}`, message: i.message }));
}

async function servedParticipants(studyId: number, ids: string[]): Promise<Map<string, Served>> {
  const out = new Map<string, Served>();
  for (let i = 0; i < ids.length; i += 1000) {
    const rows = await Participant.findAll({ where: { studyId, participantId: ids.slice(i, i + 1000) }, attributes: ['id', 'participantId', 'designVersionId', 'result'] });
    for (const r of rows) {
      const items = ((r.result as { items?: Array<{ id: string }> }).items ?? []).map((item) => item.id);
      out.set(r.participantId, { ref: r.id, participantId: r.participantId, designVersionId: r.designVersionId, itemIds: new Set(items), itemCount: items.length });
    }
  }
  return out;
}

/**
 * Every participant served with a frozen version, as the analysis core reads them: the
 * calibration items of the version's bank (built with the delay unit of the key that served
 * them) with their answers, the served pairs with the stage-2 answers on record (null where
 * none), the attention check and the serving flag.
 */
export async function loadStudyData(studyId: number, version: { id: number; hash: string; content: FrozenDesign }): Promise<ParticipantData[]> {
  db();
  const people = await Participant.findAll({ where: { studyId, designVersionId: version.id }, order: [['id', 'ASC']] });
  if (people.length === 0) return [];
  const answers = await Stage2Answer.findAll({ where: { studyId, participantRef: people.map((p) => p.id) }, attributes: ['participantRef', 'itemId', 'chosen', 'responseMs'] });
  const byPerson = new Map<number, Map<string, { chosen: string; responseMs: number | null }>>();
  for (const a of answers) {
    if (!byPerson.has(a.participantRef)) byPerson.set(a.participantRef, new Map());
    byPerson.get(a.participantRef)!.set(a.itemId, { chosen: a.chosen, responseMs: a.responseMs ?? null });
  }
  const keyIds = [...new Set(people.map((p) => p.apiKeyId).filter((k): k is number => k !== null))];
  const units = new Map((await ApiKey.findAll({ where: { id: keyIds }, attributes: ['id', 'delayUnit'] })).map((k) => [k.id, k.delayUnit]));
  return people.map((p) => {
    const bank = bankFor(version, { delayUnit: p.apiKeyId !== null ? units.get(p.apiKeyId) : undefined }).bank;
    return participantData({
      participantId: p.participantId,
      calibrationItems: bank.items,
      responses: p.responses,
      served: p.result as Parameters<typeof participantData>[0]['served'],
      answers: byPerson.get(p.id) ?? new Map(),
    });
  });
}

/** What the results page shows before an analysis is saved: counts of data and of what each exclusion rule would remove. */
export async function observedSummary(studyId: number, version: { id: number; hash: string; content: FrozenDesign }, rules: ExclusionRules) {
  const data = await loadStudyData(studyId, version);
  const answered = data.filter((p) => p.pairs.some((q) => q.far.choice !== null || q.near.choice !== null)).length;
  const complete = data.filter((p) => p.pairs.length > 0 && p.pairs.every((q) => q.far.choice !== null && q.near.choice !== null)).length;
  const report = applyExclusions(data, rules);
  return { participants: data.length, withAnswers: answered, complete, exclusions: report.rules, kept: report.kept.length };
}
