// Stage-2 answers and session status on the real MariaDB: the one writer of stage2_answers
// (recordStage2Answers), its idempotency, 409 and 422 rules, 50 parallel identical submissions
// creating one record per item, and the statuses read from participants + participant_sessions.
import { beforeAll, describe, expect, it } from 'vitest';
import { Participant, ParticipantSession, Stage2Answer, Study } from '@/db/models';
import { ApiError } from '@/lib/server/errors';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { serveProbeItems, type ProbeItemsReply } from '@/lib/server/services/participants';
import { countByStatus, listSessionStatuses, sessionState } from '@/lib/server/services/session-status';
import { recordStage2Answers, type Stage2AnswerInput } from '@/lib/server/services/stage2-answers';
import { makeStudyWithTeam, migrateUp } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';

async function setUp(name: string) {
  const { study, team } = await makeStudyWithTeam(name);
  const version = await makeFrozenVersion(study.id);
  const { bank } = bankFor(version);
  const responses = answersOf(bank.items, { kSmall: 0.05, kLarge: 0.01 });
  const serve = (participantId: string) => serveProbeItems(version, participantId, responses, { source: 'batch', userId: team.operator.id });
  return { study, team, version, serve };
}

const answersFor = (reply: ProbeItemsReply, chosen: 'SS' | 'LL' = 'LL'): Stage2AnswerInput[] => reply.items.map((i) => ({ itemId: i.id, chosen, responseMs: 1200, sideShown: i.soonerSide }));

async function refusal(promise: Promise<unknown>): Promise<ApiError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof ApiError) return error;
    throw error;
  }
  throw new Error('expected a refusal');
}

describe('stage-2 answers', () => {
  let s: Awaited<ReturnType<typeof setUp>>;
  beforeAll(async () => {
    await migrateUp();
    s = await setUp('Stage-2 answers study');
  });

  it('records a partial block, completes it later, and reads the session as completed', async () => {
    const reply = await s.serve('A-001');
    const all = answersFor(reply);
    const first = await recordStage2Answers({ studyId: s.study.id, participantId: 'A-001', answers: all.slice(0, 2), source: 'api' });
    expect(first).toMatchObject({ recorded: 2, answered: 2, itemCount: all.length, status: 'served' });
    expect(first.unanswered).toEqual(all.slice(2).map((a) => a.itemId));
    const rest = await recordStage2Answers({ studyId: s.study.id, participantId: 'A-001', answers: all, source: 'api' });
    expect(rest).toMatchObject({ recorded: all.length - 2, answered: all.length, status: 'completed', unanswered: [] });
    const session = await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'A-001' } });
    expect(session?.status).toBe('completed');
    expect(session?.completedAt).not.toBeNull();
    const rows = await Stage2Answer.findAll({ where: { studyId: s.study.id } });
    expect(rows).toHaveLength(all.length);
    expect(rows[0]).toMatchObject({ chosen: 'LL', responseMs: 1200, source: 'api' });
  });

  it('completes the session when the last part of a block arrives on its own', async () => {
    const all = answersFor(await s.serve('A-010'));
    expect(await recordStage2Answers({ studyId: s.study.id, participantId: 'A-010', answers: all.slice(0, 2), source: 'api' })).toMatchObject({ status: 'served' });
    expect((await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'A-010' } }))?.status).toBe('served');
    const last = await recordStage2Answers({ studyId: s.study.id, participantId: 'A-010', answers: all.slice(2), source: 'api' });
    expect(last).toMatchObject({ recorded: all.length - 2, answered: all.length, status: 'completed', unanswered: [] });
    const session = await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'A-010' } });
    expect(session?.status).toBe('completed');
    expect(session?.completedAt).not.toBeNull();
  });

  it('updates the session row a participant already has, in place, partial block first', async () => {
    const all = answersFor(await s.serve('A-020'));
    const startedAt = new Date('2026-11-30T09:00:00Z');
    const before = await ParticipantSession.create({ studyId: s.study.id, designVersionId: s.version.id, participantId: 'A-020', status: 'served', source: 'page', apiKeyId: null, calibrationAnswers: null, startedAt, calibratedAt: startedAt, servedAt: startedAt, completedAt: null, lastActivityAt: startedAt });
    expect(await recordStage2Answers({ studyId: s.study.id, participantId: 'A-020', answers: all.slice(0, 2), source: 'api' })).toMatchObject({ status: 'served' });
    const partway = (await ParticipantSession.findAll({ where: { studyId: s.study.id, participantId: 'A-020' } })).map((r) => r.get({ plain: true }));
    expect(partway).toHaveLength(1);
    expect(partway[0]).toMatchObject({ id: before.id, status: 'served', source: 'page', servedAt: startedAt, completedAt: null });
    expect(partway[0].lastActivityAt.getTime()).toBeGreaterThan(startedAt.getTime());
    expect(await recordStage2Answers({ studyId: s.study.id, participantId: 'A-020', answers: all.slice(2), source: 'api' })).toMatchObject({ status: 'completed' });
    const after = (await ParticipantSession.findAll({ where: { studyId: s.study.id, participantId: 'A-020' } })).map((r) => r.get({ plain: true }));
    expect(after).toHaveLength(1);
    expect(after[0]).toMatchObject({ id: before.id, status: 'completed', source: 'page', startedAt, servedAt: startedAt });
    expect(after[0].completedAt).not.toBeNull();
  });

  it('refuses answers for a participant no longer on record (known to this process) and writes no session row for them', async () => {
    const all = answersFor(await s.serve('A-011')); // serving tells this process what was served
    const row = (await Participant.findOne({ where: { studyId: s.study.id, participantId: 'A-011' } }))!;
    await row.destroy();
    const error = await refusal(recordStage2Answers({ studyId: s.study.id, participantId: 'A-011', answers: all, source: 'api' }));
    expect(error.status).toBe(422);
    expect(error.message).toContain('unknown participant');
    expect(await ParticipantSession.count({ where: { studyId: s.study.id, participantId: 'A-011' } })).toBe(0);
    expect(await Stage2Answer.count({ where: { participantRef: row.id } })).toBe(0);
  });

  it('is idempotent: the same answers again record nothing and are not an error', async () => {
    const reply = await s.serve('A-002');
    const all = answersFor(reply, 'SS');
    await recordStage2Answers({ studyId: s.study.id, participantId: 'A-002', answers: all, source: 'page' });
    const again = await recordStage2Answers({ studyId: s.study.id, participantId: 'A-002', answers: all, source: 'page' });
    expect(again).toMatchObject({ recorded: 0, answered: all.length, status: 'completed' });
  });

  it('refuses a changed answer with 409 and keeps the first one', async () => {
    const reply = await s.serve('A-003');
    const all = answersFor(reply, 'SS');
    await recordStage2Answers({ studyId: s.study.id, participantId: 'A-003', answers: all.slice(0, 1), source: 'api' });
    const error = await refusal(recordStage2Answers({ studyId: s.study.id, participantId: 'A-003', answers: [{ ...all[0], chosen: 'LL' }], source: 'api' }));
    expect(error.status).toBe(409);
    expect(error.message).toContain(all[0].itemId);
    const participant = await Participant.findOne({ where: { studyId: s.study.id, participantId: 'A-003' } });
    const stored = await Stage2Answer.findAll({ where: { participantRef: participant!.id } });
    expect(stored.map((r) => [r.itemId, r.chosen])).toEqual([[all[0].itemId, 'SS']]);
  });

  it('refuses with 422 answers before calibration, items not served to the participant, and one item answered two ways', async () => {
    const early = await refusal(recordStage2Answers({ studyId: s.study.id, participantId: 'never-served', answers: [{ itemId: 'x', chosen: 'SS' }], source: 'api' }));
    expect(early.status).toBe(422);
    expect(early.issues?.[0].path).toBe('participantId');
    const reply = await s.serve('A-004');
    const foreign = await refusal(recordStage2Answers({ studyId: s.study.id, participantId: 'A-004', answers: [{ itemId: 'cal-small-01', chosen: 'SS' }], source: 'api' }));
    expect(foreign.status).toBe(422);
    expect(foreign.issues).toEqual([{ path: 'answers.0.itemId', message: expect.stringContaining('cal-small-01') }]);
    const twice = await refusal(
      recordStage2Answers({ studyId: s.study.id, participantId: 'A-004', answers: [{ itemId: reply.items[0].id, chosen: 'SS' }, { itemId: reply.items[0].id, chosen: 'LL' }], source: 'api' }),
    );
    expect(twice.status).toBe(422);
    expect(await ParticipantSession.count({ where: { studyId: s.study.id, participantId: 'A-004' } }), 'nothing is written for a refused call').toBe(0);
  });

  it('refuses answers through another design version with 409', async () => {
    await s.serve('A-005');
    const other = await makeFrozenVersion(s.study.id);
    const reply = await s.serve('A-006');
    const error = await refusal(recordStage2Answers({ studyId: s.study.id, designVersionId: other.id, participantId: 'A-006', answers: answersFor(reply), source: 'api' }));
    expect(error.status).toBe(409);
  });

  it('creates one record per item from 50 parallel submissions of the same answers', async () => {
    const reply = await s.serve('A-050');
    const all = answersFor(reply);
    const results = await Promise.all(Array.from({ length: 50 }, () => recordStage2Answers({ studyId: s.study.id, participantId: 'A-050', answers: all, source: 'api' })));
    expect(results.every((r) => r.status === 'completed' && r.answered === all.length)).toBe(true);
    expect(results.reduce((sum, r) => sum + r.recorded, 0)).toBe(all.length);
    const session = await ParticipantSession.findAll({ where: { studyId: s.study.id, participantId: 'A-050' } });
    expect(session).toHaveLength(1);
    const participant = await Participant.findOne({ where: { studyId: s.study.id, participantId: 'A-050' } });
    expect(await Stage2Answer.count({ where: { participantRef: participant!.id } })).toBe(all.length);
  });

  it('reads statuses from participants and sessions, with abandoned after the study idle time', async () => {
    const t = await setUp('Session status study');
    const now = new Date();
    const long = new Date(now.getTime() - 3 * 3600_000);
    await ParticipantSession.create({ studyId: t.study.id, designVersionId: t.version.id, participantId: 'S-started', status: 'started', source: 'page', apiKeyId: null, calibrationAnswers: null, startedAt: now, calibratedAt: null, servedAt: null, completedAt: null, lastActivityAt: now });
    await ParticipantSession.create({ studyId: t.study.id, designVersionId: t.version.id, participantId: 'S-gone', status: 'started', source: 'page', apiKeyId: null, calibrationAnswers: null, startedAt: long, calibratedAt: null, servedAt: null, completedAt: null, lastActivityAt: long });
    await t.serve('S-served');
    const done = await t.serve('S-done');
    await recordStage2Answers({ studyId: t.study.id, participantId: 'S-done', answers: answersFor(done), source: 'api' });
    const study = (await Study.findByPk(t.study.id))!;
    expect(study.sessionIdleMinutes).toBe(60);
    const rows = await listSessionStatuses(t.study.id, { idleMinutes: study.sessionIdleMinutes, now });
    const byId = Object.fromEntries(rows.map((r) => [r.participantId, r]));
    expect(byId['S-started'].status).toBe('started');
    expect(byId['S-gone'].status).toBe('abandoned');
    expect(byId['S-served']).toMatchObject({ status: 'served', answered: 0, itemCount: done.items.length });
    expect(byId['S-done']).toMatchObject({ status: 'completed', answered: done.items.length });
    expect(countByStatus(rows)).toEqual({ started: 1, calibrated: 0, served: 1, completed: 1, abandoned: 1 });
    // The same rows read three hours later: everything unfinished is abandoned, completed stays.
    const later = await listSessionStatuses(t.study.id, { idleMinutes: 60, now: new Date(now.getTime() + 3 * 3600_000) });
    expect(countByStatus(later)).toEqual({ started: 0, calibrated: 0, served: 0, completed: 1, abandoned: 3 });
  });
});

describe('sessionState', () => {
  const at = new Date('2026-01-01T00:00:00Z');
  const minutes = (m: number) => new Date(at.getTime() + m * 60_000);
  it('treats a served participant without a session row as served', () => {
    expect(sessionState({ stored: null, served: true, lastActivityAt: at, idleMinutes: 60, now: minutes(5) })).toBe('served');
  });
  it('reads abandoned only past the idle time and never for a completed session', () => {
    expect(sessionState({ stored: 'calibrated', served: false, lastActivityAt: at, idleMinutes: 60, now: minutes(60) })).toBe('calibrated');
    expect(sessionState({ stored: 'calibrated', served: false, lastActivityAt: at, idleMinutes: 60, now: minutes(61) })).toBe('abandoned');
    expect(sessionState({ stored: 'completed', served: true, lastActivityAt: at, idleMinutes: 60, now: minutes(6000) })).toBe('completed');
  });
});
