// The probe-items API on the real MariaDB: every error status, idempotency, the 409, and 50
// parallel requests for one participant creating one record.
import { beforeAll, describe, expect, it } from 'vitest';
import { ApiKey, AuditEvent, Participant } from '@/db/models';
import { POST as probeItems } from '@/app/api/v1/studies/[id]/probe-items/route';
import { GET as openapi } from '@/app/api/v1/openapi.json/route';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { DELETE as revokeKey } from '@/app/api/studies/[id]/api-keys/[keyId]/route';
import { GET as listParticipants } from '@/app/api/studies/[id]/participants/route';
import { POST as batch } from '@/app/api/studies/[id]/participants/batch/route';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { probeRateLimiter } from '@/lib/server/http/key-rate-limit';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';

type Setup = Awaited<ReturnType<typeof setUp>>;

async function setUp(name: string) {
  const { study, team } = await makeStudyWithTeam(name);
  const version = await makeFrozenVersion(study.id);
  const reply = await createKey(await requestAs(team.operator, 'POST', `/api/studies/${study.id}/api-keys`, { json: { name: 'Survey', designVersionId: version.id } }), ctx({ id: String(study.id) }));
  expect(reply.status).toBe(201);
  const { key, secret } = (await reply.json()) as { key: { id: number; prefix: string }; secret: string };
  const { bank } = bankFor(version);
  const responses = answersOf(bank.items, { kSmall: 0.05, kLarge: 0.01 });
  return { study, team, version, key, secret, responses };
}

async function ask(s: { study: { id: number } }, secret: string | null, body: unknown, studyId = s.study.id) {
  const headers: Record<string, string> = secret ? { authorization: `Bearer ${secret}` } : {};
  const response = await probeItems(await requestAs(null, 'POST', `/api/v1/studies/${studyId}/probe-items`, { json: body, headers }), ctx({ id: String(studyId) }));
  return { status: response.status, headers: response.headers, body: (await response.json()) as Record<string, unknown> & { issues?: Array<{ path: string }> } };
}

describe('the probe-items API', () => {
  let s: Setup;
  beforeAll(async () => {
    await migrateUp();
    s = await setUp('Probe API study');
  });

  it('serves estimates and the personalised probe block in presentation order', async () => {
    const reply = await ask(s, s.secret, { participantId: 'P-001', responses: s.responses });
    expect(reply.status).toBe(200);
    const body = reply.body as unknown as { estimates: { kSmall: { rate: number; standardErrorLog: number | null; flags: string[] } }; itemSet: string; items: Array<{ position: number; block: string; role: string }>; designHash: string };
    expect(body.itemSet).toBe('personal');
    expect(body.designHash).toBe(s.version.hash);
    expect(body.estimates.kSmall.flags).toEqual([]);
    expect(body.estimates.kSmall.standardErrorLog).toBeGreaterThan(0);
    expect(body.items.map((i) => i.position)).toEqual(body.items.map((_, i) => i + 1));
    expect(new Set(body.items.map((i) => i.role))).toEqual(new Set(['reversal-probe', 'late-anchor', 'soon-anchor', 'attention-check']));
  });

  it('returns the same items for the same participant and responses, and 409 with nothing changed for different responses', async () => {
    const first = await ask(s, s.secret, { participantId: 'P-002', responses: s.responses });
    const again = await ask(s, s.secret, { participantId: 'P-002', responses: s.responses });
    expect(again.status).toBe(200);
    expect(again.body).toEqual(first.body);
    const flipped = { ...s.responses, 'cal-small-01': s.responses['cal-small-01'] === 'later' ? 'sooner' : 'later' };
    const conflict = await ask(s, s.secret, { participantId: 'P-002', responses: flipped });
    expect(conflict.status).toBe(409);
    const stored = await Participant.findAll({ where: { studyId: s.study.id, participantId: 'P-002' } });
    expect(stored).toHaveLength(1);
    expect(stored[0].responses).toEqual(s.responses);
  });

  it('gives flagged participants the fallback set and the flag', async () => {
    const allSooner = Object.fromEntries(Object.keys(s.responses).map((id) => [id, 'sooner']));
    const reply = await ask(s, s.secret, { participantId: 'P-flag', responses: allSooner });
    expect(reply.status).toBe(200);
    expect(reply.body.flag).toBe('all-sooner');
    expect(reply.body.itemSet).toBe('fallback');
    expect((reply.body.items as Array<{ set: string }>).every((i) => i.set === 'fallback')).toBe(true);
  });

  it('answers 401 without a key, with an unknown key and with a revoked key', async () => {
    expect((await ask(s, null, { participantId: 'x', responses: s.responses })).status).toBe(401);
    expect((await ask(s, 'sbk_nothing_at_all', { participantId: 'x', responses: s.responses })).status).toBe(401);
    const other = await setUp('Revoked key study');
    expect((await ask(other, other.secret, { participantId: 'R-1', responses: other.responses })).status).toBe(200);
    const revoked = await revokeKey(await requestAs(other.team.operator, 'DELETE', `/api/studies/${other.study.id}/api-keys/${other.key.id}`), ctx({ id: String(other.study.id), keyId: String(other.key.id) }));
    expect(revoked.status).toBe(200);
    expect((await ask(other, other.secret, { participantId: 'R-2', responses: other.responses })).status).toBe(401);
    const actions = (await AuditEvent.findAll({ where: { studyId: other.study.id } })).map((e) => e.action);
    expect(actions).toEqual(expect.arrayContaining(['api-key.create', 'api-key.revoke']));
  });

  it('refuses a key revoked by another process at once, although this process still has it cached', async () => {
    const other = await setUp('Key revoked elsewhere study');
    expect((await ask(other, other.secret, { participantId: 'E-1', responses: other.responses })).status).toBe(200);
    // what another server process's revoke leaves behind: the row changed, this process's cache not
    await ApiKey.update({ revokedAt: new Date() }, { where: { id: other.key.id } });
    expect((await ask(other, other.secret, { participantId: 'E-2', responses: other.responses })).status).toBe(401);
    expect((await ask(other, other.secret, { participantId: 'E-1', responses: other.responses })).status).toBe(401);
    expect(await Participant.count({ where: { studyId: other.study.id, participantId: 'E-2' } })).toBe(0);
  });

  it('records the participant with the key, the served time and the reply it sent', async () => {
    const reply = await ask(s, s.secret, { participantId: 'P-record', responses: s.responses });
    expect(reply.status).toBe(200);
    const stored = await Participant.findOne({ where: { studyId: s.study.id, participantId: 'P-record' } });
    expect(stored?.apiKeyId).toBe(s.key.id);
    expect(stored?.source).toBe('api');
    expect(stored?.designVersionId).toBe(s.version.id);
    // created_at keeps whole seconds; the same instant in UTC, not shifted by a time zone
    expect(Math.abs(stored!.createdAt.getTime() - Date.parse(reply.body.servedAt as string))).toBeLessThan(1000);
    expect(stored?.result).toEqual(reply.body);
  });

  it("answers 404 for a key of another study", async () => {
    const other = await setUp('Other study');
    expect((await ask(s, other.secret, { participantId: 'x', responses: s.responses })).status).toBe(404);
  });

  it('answers 422 naming unknown items, missing responses and invalid choices', async () => {
    const { 'cal-large-03': _dropped, ...rest } = s.responses;
    void _dropped;
    const reply = await ask(s, s.secret, { participantId: 'P-bad', responses: { ...rest, 'cal-small-02': 'maybe', 'no-such-item': 'later' } });
    expect(reply.status).toBe(422);
    const paths = (reply.body.issues ?? []).map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['responses.cal-large-03', 'responses.cal-small-02', 'responses.no-such-item']));
    expect(await Participant.count({ where: { studyId: s.study.id, participantId: 'P-bad' } })).toBe(0);
  });

  it('answers 429 with Retry-After once a key has used up its budget', async () => {
    const limited = await setUp('Rate-limited study');
    const { capacity, perSecond } = probeRateLimiter;
    probeRateLimiter.capacity = 3;
    probeRateLimiter.perSecond = 0.01;
    probeRateLimiter.reset();
    try {
      const statuses = [];
      for (let i = 0; i < 5; i++) statuses.push((await ask(limited, limited.secret, { participantId: `L-${i}`, responses: limited.responses })).status);
      expect(statuses.slice(0, 3)).toEqual([200, 200, 200]);
      const last = await ask(limited, limited.secret, { participantId: 'L-x', responses: limited.responses });
      expect(last.status).toBe(429);
      expect(Number(last.headers.get('retry-after'))).toBeGreaterThan(0);
    } finally {
      probeRateLimiter.capacity = capacity;
      probeRateLimiter.perSecond = perSecond;
      probeRateLimiter.reset();
    }
  });

  it('creates one record for 50 parallel requests about one participant', async () => {
    const replies = await Promise.all(Array.from({ length: 50 }, () => ask(s, s.secret, { participantId: 'P-parallel', responses: s.responses })));
    expect(replies.map((r) => r.status)).toEqual(Array(50).fill(200));
    expect(new Set(replies.map((r) => JSON.stringify(r.body.items))).size).toBe(1);
    expect(await Participant.count({ where: { studyId: s.study.id, participantId: 'P-parallel' } })).toBe(1);
  });

  it('lists served participants for viewers and exports them as CSV', async () => {
    const viewer: TestUser = s.team.viewer;
    const list = await listParticipants(await requestAs(viewer, 'GET', `/api/studies/${s.study.id}/participants`), ctx({ id: String(s.study.id) }));
    const body = (await list.json()) as { participants: Array<{ participantId: string }> };
    expect(body.participants.map((p) => p.participantId)).toEqual(expect.arrayContaining(['P-001', 'P-002', 'P-flag']));
    const csv = await listParticipants(await requestAs(viewer, 'GET', `/api/studies/${s.study.id}/participants?format=csv`), ctx({ id: String(s.study.id) }));
    expect(csv.headers.get('content-type')).toContain('text/csv');
    expect(await csv.text()).toContain('P-001');
  });

  it('serves a batch CSV of offline answers and reports refused rows', async () => {
    const ids = Object.keys(s.responses);
    const csv = [`participantId,${ids.join(',')}`, `B-1,${ids.map((id) => s.responses[id]).join(',')}`, `B-2,${ids.map(() => 'maybe').join(',')}`].join('\n');
    const reply = await batch(await requestAs(s.team.operator, 'POST', `/api/studies/${s.study.id}/participants/batch`, { json: { designVersionId: s.version.id, csv } }), ctx({ id: String(s.study.id) }));
    expect(reply.status).toBe(200);
    const { results } = (await reply.json()) as { results: Array<{ participantId: string; status: string; httpStatus?: number }> };
    expect(results.map((r) => [r.participantId, r.status, r.httpStatus])).toEqual([['B-1', 'served', undefined], ['B-2', 'refused', 422]]);
  });

  it('publishes an OpenAPI 3.1 document describing the endpoint', async () => {
    const reply = await openapi(await requestAs(null, 'GET', '/api/v1/openapi.json'), ctx({}));
    const doc = (await reply.json()) as { openapi: string; paths: Record<string, unknown> };
    expect(doc.openapi).toBe('3.1.0');
    expect(Object.keys(doc.paths)).toEqual(expect.arrayContaining(['/api/v1/studies/{id}/probe-items', '/api/v1/studies/{id}/calibration', '/api/v1/studies/{id}/stage2-answers']));
    // every error status the session endpoints answer is documented, and each endpoint has an example
    const text = JSON.stringify(doc.paths);
    const answers = (doc.paths['/api/v1/studies/{id}/stage2-answers'] as { post: { responses: Record<string, unknown>; requestBody: { content: { 'application/json': { example: unknown } } } } }).post;
    expect(Object.keys(answers.responses).sort()).toEqual(['200', '400', '401', '403', '404', '409', '413', '422', '429', '503']);
    // the probe endpoint reads a body too: its replies are the same set, each error with an example message
    const probe = (doc.paths['/api/v1/studies/{id}/probe-items'] as { post: { responses: Record<string, { content?: { 'application/json': { example?: { error: string } } } }> } }).post;
    expect(Object.keys(probe.responses).sort()).toEqual(Object.keys(answers.responses).sort());
    for (const [status, reply] of Object.entries(probe.responses)) if (status !== '200') expect(reply.content?.['application/json'].example?.error, status).toMatch(/\w/);
    expect(answers.requestBody.content['application/json'].example).toBeDefined();
    expect(text).toContain('length varies');
  });
});
