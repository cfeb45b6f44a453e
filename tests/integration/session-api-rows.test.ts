// Two rules of the session API on the real MariaDB, through the Next routes: a participant served
// through the probe-items API has a session row from that moment (status served, then completed
// with their stage-2 answers), and a revoked browser key's 401 is readable by the page holding it
// (CORS headers of the key's own origins, even when no active key of the study lists them).
import { beforeAll, describe, expect, it } from 'vitest';
import { ApiKey, ParticipantSession } from '@/db/models';
import { GET as calibrationRoute } from '@/app/api/v1/studies/[id]/calibration/route';
import { POST as probeRoute } from '@/app/api/v1/studies/[id]/probe-items/route';
import { POST as answersRoute } from '@/app/api/v1/studies/[id]/stage2-answers/route';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { DELETE as revokeKey } from '@/app/api/studies/[id]/api-keys/[keyId]/route';
import { handleCalibration } from '@/lib/server/http/session-endpoints';
import { listSessionStatuses } from '@/lib/server/services/session-status';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';

const PAGE = 'http://only-this-key.example.test:3150';

async function setUp(name: string) {
  const { study, team } = await makeStudyWithTeam(name);
  const version = await makeFrozenVersion(study.id);
  const key = async (input: Record<string, unknown>) => {
    const reply = await createKey(await requestAs(team.operator, 'POST', `/api/studies/${study.id}/api-keys`, { json: { name: 'Key', designVersionId: version.id, ...input } }), ctx({ id: String(study.id) }));
    expect(reply.status).toBe(201);
    return (await reply.json()) as { key: { id: number }; secret: string };
  };
  return { study, team, version, key };
}

const call = async (handler: unknown, method: string, path: string, studyId: number, headers: Record<string, string>, json?: unknown) => {
  const response = await (handler as (r: never, c: never) => Promise<Response>)((await requestAs(null, method, path, { json, headers })) as never, ctx({ id: String(studyId) }) as never);
  return { status: response.status, headers: response.headers, body: (await response.json()) as Record<string, unknown> };
};

describe('session rows of API participants', () => {
  beforeAll(migrateUp);

  it('records the session as served when the probe-items API scores the calibration answers, and completed with the answers', async () => {
    const s = await setUp('API session rows');
    const server = await s.key({});
    const auth = { authorization: `Bearer ${server.secret}` };
    const responses = answersOf(bankFor(s.version).bank.items, { kSmall: 0.05, kLarge: 0.01 });
    expect(await ParticipantSession.count({ where: { studyId: s.study.id } })).toBe(0);
    const served = await call(probeRoute, 'POST', `/api/v1/studies/${s.study.id}/probe-items`, s.study.id, auth, { participantId: 'R-1', responses });
    expect(served.status).toBe(200);
    const row = await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'R-1' } });
    expect(row).toMatchObject({ status: 'served', source: 'api', apiKeyId: server.key.id });
    expect(row!.servedAt).not.toBeNull();
    // a replay keeps one row
    expect((await call(probeRoute, 'POST', `/api/v1/studies/${s.study.id}/probe-items`, s.study.id, auth, { participantId: 'R-1', responses })).status).toBe(200);
    expect(await ParticipantSession.count({ where: { studyId: s.study.id, participantId: 'R-1' } })).toBe(1);
    // a session started through the calibration endpoint moves on from started to served
    await call(calibrationRoute, 'GET', `/api/v1/studies/${s.study.id}/calibration?participantId=R-2`, s.study.id, auth);
    expect((await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'R-2' } }))?.status).toBe('started');
    await call(probeRoute, 'POST', `/api/v1/studies/${s.study.id}/probe-items`, s.study.id, auth, { participantId: 'R-2', responses });
    expect((await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'R-2' } }))?.status).toBe('served');
    const items = served.body.items as Array<{ id: string }>;
    const done = await call(answersRoute, 'POST', `/api/v1/studies/${s.study.id}/stage2-answers`, s.study.id, auth, { participantId: 'R-1', answers: items.map((i) => ({ itemId: i.id, chosen: 'later' })) });
    expect(done.body.status).toBe('completed');
    const statuses = await listSessionStatuses(s.study.id, { idleMinutes: 60 });
    expect(statuses.map((r) => [r.participantId, r.status]).sort()).toEqual([['R-1', 'completed'], ['R-2', 'served']]);
  });
});

describe('session rows written in the same round trip as the participant', () => {
  it('are left alone when the insert records nobody: a changed replay (409) and a key revoked by another process', async () => {
    const s = await setUp('API session rows, nothing recorded');
    const server = await s.key({});
    const auth = { authorization: `Bearer ${server.secret}` };
    const items = bankFor(s.version).bank.items;
    const responses = answersOf(items, { kSmall: 0.05, kLarge: 0.01 });
    const probe = (participantId: string, answers: Record<string, string>) => call(probeRoute, 'POST', `/api/v1/studies/${s.study.id}/probe-items`, s.study.id, auth, { participantId, responses: answers });
    expect((await probe('N-1', responses)).status).toBe(200);
    const long = new Date('2026-01-02T03:04:05.000Z');
    await ParticipantSession.update({ lastActivityAt: long }, { where: { studyId: s.study.id, participantId: 'N-1' } });
    // other calibration answers for a served participant: 409, and their session row is untouched
    expect((await probe('N-1', answersOf(items, { kSmall: 0.2, kLarge: 0.001 }))).status).toBe(409);
    expect((await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'N-1' } }))?.lastActivityAt.toISOString()).toBe(long.toISOString());
    // the same answers again: a replay, which counts as activity
    expect((await probe('N-1', responses)).status).toBe(200);
    expect((await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'N-1' } }))?.lastActivityAt.getTime()).toBeGreaterThan(long.getTime());
    // revoked through another process: this one still has the key cached, the insert refuses it, and no session row appears
    await ApiKey.update({ revokedAt: new Date() }, { where: { id: server.key.id } });
    expect((await probe('N-2', responses)).status).toBe(401);
    expect(await ParticipantSession.count({ where: { studyId: s.study.id, participantId: 'N-2' } })).toBe(0);
  });
});

describe('a revoked browser key', () => {
  it("answers 401 with the CORS headers of the key's own origins, on every session endpoint", async () => {
    const s = await setUp('Revoked browser key');
    const browser = await s.key({ name: 'Public page', kind: 'browser', allowedOrigins: [PAGE] });
    const headers = { authorization: `Bearer ${browser.secret}`, origin: PAGE };
    const started = await call(calibrationRoute, 'GET', `/api/v1/studies/${s.study.id}/calibration?participantId=V-1`, s.study.id, headers);
    expect(started.status).toBe(200);
    const revoked = await revokeKey(await requestAs(s.team.operator, 'DELETE', `/api/studies/${s.study.id}/api-keys/${browser.key.id}`), ctx({ id: String(s.study.id), keyId: String(browser.key.id) }));
    expect(revoked.status).toBe(200);
    const token = { 'x-session-token': started.body.sessionToken as string };
    for (const [handler, method, path, json] of [
      [calibrationRoute, 'GET', `/api/v1/studies/${s.study.id}/calibration?participantId=V-1`, undefined],
      [probeRoute, 'POST', `/api/v1/studies/${s.study.id}/probe-items`, { participantId: 'V-1', responses: {} }],
      [answersRoute, 'POST', `/api/v1/studies/${s.study.id}/stage2-answers`, { participantId: 'V-1', answers: [] }],
    ] as const) {
      const reply = await call(handler, method, path, s.study.id, { ...headers, ...token }, json);
      expect(reply.status, path).toBe(401);
      expect(reply.headers.get('access-control-allow-origin'), path).toBe(PAGE);
      expect(reply.body.error).toContain('revoked');
    }
    // the framework-free function the direct path runs gives the same
    const direct = await handleCalibration({ studyId: String(s.study.id), authorization: headers.authorization, origin: PAGE, query: new URLSearchParams('participantId=V-1'), readBody: async () => '' });
    expect([direct.status, direct.headers['Access-Control-Allow-Origin']]).toEqual([401, PAGE]);
    // another origin still learns nothing
    const elsewhere = await call(calibrationRoute, 'GET', `/api/v1/studies/${s.study.id}/calibration?participantId=V-1`, s.study.id, { ...headers, origin: 'http://elsewhere.example.test' });
    expect([elsewhere.status, elsewhere.headers.get('access-control-allow-origin')]).toEqual([401, null]);
    // and the key of another study never lends its origins here
    const other = await setUp('Another study');
    const foreign = await call(calibrationRoute, 'GET', `/api/v1/studies/${other.study.id}/calibration?participantId=V-1`, other.study.id, headers);
    expect([foreign.status, foreign.headers.get('access-control-allow-origin')]).toEqual([401, null]);
  });
});
