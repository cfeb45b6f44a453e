// The two-stage session API on the real MariaDB, through the Next routes: the calibration block by
// key (agreeing item by item with an export in the same units), probe items scored with the key's
// item bank (a mismatched one refused), stage-2 answers (every error status, idempotency, 409, 50
// parallel submissions creating one record each), browser keys (origin, token, own limit) and the
// CORS headers on every reply, refusals included.
import { beforeAll, describe, expect, it } from 'vitest';
import { Participant, ParticipantSession, Stage2Answer } from '@/db/models';
import { GET as calibrationRoute, OPTIONS as calibrationPreflight } from '@/app/api/v1/studies/[id]/calibration/route';
import { POST as probeRoute } from '@/app/api/v1/studies/[id]/probe-items/route';
import { POST as answersRoute, OPTIONS as answersPreflight } from '@/app/api/v1/studies/[id]/stage2-answers/route';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { GET as exportRoute } from '@/app/api/studies/[id]/item-bank/[versionId]/export/route';
import { probeRateLimiter } from '@/lib/server/http/key-rate-limit';
import { browserRateLimiter } from '@/lib/server/http/session-endpoints';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';

const LAB = 'http://lab.example.test:3141';
const ELSEWHERE = 'http://elsewhere.example.test:3142';

type Item = { id: string; block: string; role: string; magnitude: string | null; soonerAmount: number; laterAmount: number; laterDelay: number; soonerDelay: number; soonerSide: string; position: number; text: string };
type Json = Record<string, unknown> & { error?: string; issues?: Array<{ path: string; message: string }> };

async function setUp(name: string, keyInput: Record<string, unknown> = {}) {
  const { study, team } = await makeStudyWithTeam(name);
  const version = await makeFrozenVersion(study.id);
  const key = async (input: Record<string, unknown>) => {
    const reply = await createKey(await requestAs(team.operator, 'POST', `/api/studies/${study.id}/api-keys`, { json: { name: 'Session software', designVersionId: version.id, ...input } }), ctx({ id: String(study.id) }));
    expect(reply.status, JSON.stringify(await reply.clone().json())).toBe(201);
    return (await reply.json()) as { key: { id: number; itemBankId: string; presentation: { delayUnit: string } }; secret: string };
  };
  const server = await key(keyInput);
  return { study, team, version, key, server };
}

type Call = { secret?: string | null; origin?: string; token?: string; studyId?: number };

async function send(handler: (r: never, c: never) => Promise<Response>, method: string, path: string, studyId: number, options: Call & { json?: unknown }) {
  const headers: Record<string, string> = {};
  if (options.secret) headers.authorization = `Bearer ${options.secret}`;
  if (options.origin) headers.origin = options.origin;
  if (options.token) headers['x-session-token'] = options.token;
  const response = await handler((await requestAs(null, method, path, { json: options.json, headers })) as never, ctx({ id: String(studyId) }) as never);
  const text = await response.text();
  return { status: response.status, headers: response.headers, body: (text ? JSON.parse(text) : {}) as Json };
}

const calibration = (studyId: number, query: string, options: Call = {}) => send(calibrationRoute as never, 'GET', `/api/v1/studies/${studyId}/calibration${query}`, options.studyId ?? studyId, options);
const probe = (studyId: number, json: unknown, options: Call = {}) => send(probeRoute as never, 'POST', `/api/v1/studies/${studyId}/probe-items`, studyId, { ...options, json });
const answers = (studyId: number, json: unknown, options: Call = {}) => send(answersRoute as never, 'POST', `/api/v1/studies/${studyId}/stage2-answers`, studyId, { ...options, json });

describe('the calibration block and the export agree', () => {
  beforeAll(migrateUp);

  for (const delayUnit of ['weeks', 'months'] as const) {
    it(`serves, item by item, the calibration items of an export in ${delayUnit}, and scores answers with them`, async () => {
      const s = await setUp(`Export agreement ${delayUnit}`, { delayUnit, minGap: 3 });
      expect(s.server.key.presentation.delayUnit).toBe(delayUnit);
      const file = await exportRoute(await requestAs(s.team.operator, 'GET', `/api/studies/${s.study.id}/item-bank/${s.version.id}/export?format=json&delayUnit=${delayUnit}&minGap=3`), ctx({ id: String(s.study.id), versionId: String(s.version.id) }));
      const exported = (await file.json()) as { header: { itemBankId: string }; items: Item[] };
      const block = await calibration(s.study.id, '', { secret: s.server.secret });
      expect(block.status).toBe(200);
      expect(block.body.itemBankId).toBe(exported.header.itemBankId);
      expect(s.server.key.itemBankId).toBe(exported.header.itemBankId);
      const exportedCalibration = exported.items.filter((i) => i.block === 'calibration');
      expect(block.body.items).toEqual(exportedCalibration);
      expect(exportedCalibration.filter((i) => i.role === 'calibration').every((i) => i.laterDelay % (delayUnit === 'weeks' ? 7 : 30) === 0)).toBe(true);
      // The day-based export has the same item ids with other delays: its id is refused, never rescored.
      const days = await exportRoute(await requestAs(s.team.operator, 'GET', `/api/studies/${s.study.id}/item-bank/${s.version.id}/export?format=json`), ctx({ id: String(s.study.id), versionId: String(s.version.id) }));
      const dayBank = (await days.json()) as { header: { itemBankId: string }; items: Item[] };
      expect(dayBank.items.filter((i) => i.block === 'calibration').map((i) => i.id).sort()).toEqual(exportedCalibration.map((i) => i.id).sort());
      expect(dayBank.header.itemBankId).not.toBe(exported.header.itemBankId);
      const responses = answersOf(exportedCalibration, { kSmall: 0.05, kLarge: 0.01 });
      const refused = await probe(s.study.id, { participantId: 'U-1', responses, itemBankId: dayBank.header.itemBankId }, { secret: s.server.secret });
      expect(refused.status).toBe(422);
      expect(refused.body.issues?.[0].path).toBe('itemBankId');
      expect(refused.body.issues?.[0].message).toContain(delayUnit);
      expect(await Participant.count({ where: { studyId: s.study.id } })).toBe(0);
      const served = await probe(s.study.id, { participantId: 'U-1', responses, itemBankId: exported.header.itemBankId }, { secret: s.server.secret });
      expect(served.status).toBe(200);
      const unitWord = delayUnit === 'weeks' ? 'week' : 'month';
      expect((served.body.items as Item[]).filter((i) => i.laterDelay > 0).every((i) => i.text.includes(unitWord))).toBe(true);
    });
  }

  it('shuffles the block per participant when asked, the same way every time', async () => {
    const s = await setUp('Calibration order');
    const bank = await calibration(s.study.id, '', { secret: s.server.secret });
    const a1 = await calibration(s.study.id, '?participantId=O-1&order=participant', { secret: s.server.secret });
    const a2 = await calibration(s.study.id, '?participantId=O-1&order=participant', { secret: s.server.secret });
    const b = await calibration(s.study.id, '?participantId=O-2&order=participant', { secret: s.server.secret });
    const ids = (r: { body: Json }) => (r.body.items as Item[]).map((i) => i.id);
    expect(ids(a1)).toEqual(ids(a2));
    expect(ids(a1)).not.toEqual(ids(b));
    expect([...ids(a1)].sort()).toEqual([...ids(bank)].sort());
    expect((a1.body.items as Item[]).map((i) => i.position)).toEqual(ids(a1).map((_, i) => i + 1));
    expect((await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'O-1' } }))?.status).toBe('started');
  });

  it('answers 422 naming a bad query, 401 without a key and 404 for another study', async () => {
    const s = await setUp('Calibration errors');
    const bad = await calibration(s.study.id, '?order=random', { secret: s.server.secret });
    expect(bad.status).toBe(422);
    expect(bad.body.issues?.[0].path).toBe('order');
    expect((await calibration(s.study.id, '?order=participant', { secret: s.server.secret })).status).toBe(422);
    expect((await calibration(s.study.id, '?participantId=bad id!', { secret: s.server.secret })).status).toBe(422);
    expect((await calibration(s.study.id, '?colour=red', { secret: s.server.secret })).status).toBe(422);
    expect((await calibration(s.study.id, '', {})).status).toBe(401);
    const other = await setUp('Calibration other study');
    expect((await calibration(s.study.id, '', { secret: other.server.secret })).status).toBe(404);
  });
});

describe('stage-2 answers through the API', () => {
  let s: Awaited<ReturnType<typeof setUp>>;
  let responses: Record<string, string>;
  beforeAll(async () => {
    await migrateUp();
    s = await setUp('Stage-2 API study');
    const block = await calibration(s.study.id, '', { secret: s.server.secret });
    responses = answersOf(block.body.items as Item[], { kSmall: 0.05, kLarge: 0.01 });
  });

  const serve = async (participantId: string) => {
    const reply = await probe(s.study.id, { participantId, responses }, { secret: s.server.secret });
    expect(reply.status).toBe(200);
    return reply.body.items as Item[];
  };

  it('records answers, is idempotent, takes a block in parts and completes it', async () => {
    const items = await serve('T-001');
    const all = items.map((i) => ({ itemId: i.id, chosen: 'later', responseTimeMs: 1500, sideShown: i.soonerSide }));
    const part = await answers(s.study.id, { participantId: 'T-001', answers: all.slice(0, 2) }, { secret: s.server.secret });
    expect(part.status).toBe(200);
    expect(part.body).toMatchObject({ recorded: 2, answered: 2, itemCount: items.length, status: 'served' });
    const replay = await answers(s.study.id, { participantId: 'T-001', answers: all.slice(0, 2) }, { secret: s.server.secret });
    expect(replay.body).toMatchObject({ recorded: 0, answered: 2 });
    const rest = await answers(s.study.id, { participantId: 'T-001', answers: all }, { secret: s.server.secret });
    expect(rest.body).toMatchObject({ recorded: items.length - 2, answered: items.length, status: 'completed', unanswered: [] });
    const participant = await Participant.findOne({ where: { studyId: s.study.id, participantId: 'T-001' } });
    const stored = await Stage2Answer.findAll({ where: { participantRef: participant!.id } });
    expect(stored.every((a) => a.chosen === 'LL' && a.responseMs === 1500 && a.source === 'api' && a.apiKeyId === s.server.key.id)).toBe(true);
  });

  it('answers every error status: 400, 401, 404, 409, 413, 422 and 429', async () => {
    const items = await serve('T-002');
    const one = [{ itemId: items[0].id, chosen: 'sooner' }];
    expect((await answers(s.study.id, { participantId: 'T-002', answers: one }, {})).status).toBe(401);
    expect((await answers(s.study.id, { participantId: 'T-002', answers: one }, { secret: 'sbk_unknown_key' })).status).toBe(401);
    const other = await setUp('Stage-2 other study');
    expect((await answers(s.study.id, { participantId: 'T-002', answers: one }, { secret: other.server.secret })).status).toBe(404);
    const malformed = await answersRoute((await requestAs(null, 'POST', `/api/v1/studies/${s.study.id}/stage2-answers`, { body: '{"participantId":', headers: { authorization: `Bearer ${s.server.secret}` } })) as never, ctx({ id: String(s.study.id) }) as never);
    expect(malformed.status).toBe(400);
    const huge = await answersRoute((await requestAs(null, 'POST', `/api/v1/studies/${s.study.id}/stage2-answers`, { body: 'x'.repeat(1_100_000), headers: { authorization: `Bearer ${s.server.secret}` } })) as never, ctx({ id: String(s.study.id) }) as never);
    expect(huge.status).toBe(413);
    expect((await answers(s.study.id, { participantId: 'T-002', answers: one }, { secret: s.server.secret })).status).toBe(200);
    const changed = await answers(s.study.id, { participantId: 'T-002', answers: [{ itemId: items[0].id, chosen: 'later' }] }, { secret: s.server.secret });
    expect(changed.status).toBe(409);
    expect(changed.body.error).toContain(items[0].id);
    const notServed = await answers(s.study.id, { participantId: 'T-002', answers: [{ itemId: 'cal-small-01', chosen: 'later' }] }, { secret: s.server.secret });
    expect([notServed.status, notServed.body.issues?.[0].path]).toEqual([422, 'answers.0.itemId']);
    const early = await answers(s.study.id, { participantId: 'T-never', answers: one }, { secret: s.server.secret });
    expect([early.status, early.body.issues?.[0].path]).toEqual([422, 'participantId']);
    const invalid = await answers(s.study.id, { participantId: 'T-002', answers: [{ itemId: items[1].id, chosen: 'maybe', responseTimeMs: -4 }] }, { secret: s.server.secret });
    expect(invalid.status).toBe(422);
    expect(invalid.body.issues?.map((i) => i.path)).toEqual(expect.arrayContaining(['answers.0.chosen', 'answers.0.responseTimeMs']));
    const { capacity, perSecond } = probeRateLimiter;
    probeRateLimiter.capacity = 1;
    probeRateLimiter.perSecond = 0.01;
    probeRateLimiter.reset();
    try {
      await answers(s.study.id, { participantId: 'T-002', answers: one }, { secret: s.server.secret });
      const limited = await answers(s.study.id, { participantId: 'T-002', answers: one }, { secret: s.server.secret });
      expect(limited.status).toBe(429);
      expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(0);
    } finally {
      probeRateLimiter.capacity = capacity;
      probeRateLimiter.perSecond = perSecond;
      probeRateLimiter.reset();
    }
  });

  it('creates one record per item from 50 parallel submissions of the same answers', async () => {
    const items = await serve('T-050');
    const all = items.map((i) => ({ itemId: i.id, chosen: 'sooner' }));
    const replies = await Promise.all(Array.from({ length: 50 }, () => answers(s.study.id, { participantId: 'T-050', answers: all }, { secret: s.server.secret })));
    expect(replies.map((r) => r.status)).toEqual(Array(50).fill(200));
    const participant = await Participant.findOne({ where: { studyId: s.study.id, participantId: 'T-050' } });
    expect(await Stage2Answer.count({ where: { participantRef: participant!.id } })).toBe(items.length);
    expect(await ParticipantSession.count({ where: { studyId: s.study.id, participantId: 'T-050' } })).toBe(1);
  });
});

describe('browser keys and CORS', () => {
  let s: Awaited<ReturnType<typeof setUp>>;
  let browser: Awaited<ReturnType<Awaited<ReturnType<typeof setUp>>['key']>>;
  beforeAll(async () => {
    await migrateUp();
    s = await setUp('Browser key study');
    browser = await s.key({ name: 'Public page', kind: 'browser', allowedOrigins: [LAB] });
  });

  it('refuses to create a browser key without origins, or with an origin that has a path', async () => {
    const refused = await createKey(await requestAs(s.team.operator, 'POST', `/api/studies/${s.study.id}/api-keys`, { json: { name: 'x', designVersionId: s.version.id, kind: 'browser' } }), ctx({ id: String(s.study.id) }));
    expect(refused.status).toBe(422);
    const withPath = await createKey(await requestAs(s.team.operator, 'POST', `/api/studies/${s.study.id}/api-keys`, { json: { name: 'x', designVersionId: s.version.id, kind: 'browser', allowedOrigins: ['https://lab.example.test/page'] } }), ctx({ id: String(s.study.id) }));
    expect(withPath.status).toBe(422);
  });

  it('runs a whole session from a listed origin with the session token, every reply carrying the CORS headers', async () => {
    const start = await calibration(s.study.id, '?participantId=W-1', { secret: browser.secret, origin: LAB });
    expect(start.status).toBe(200);
    expect(start.headers.get('access-control-allow-origin')).toBe(LAB);
    expect(start.headers.get('access-control-expose-headers')).toContain('Retry-After');
    const token = start.body.sessionToken as string;
    expect(token).toMatch(/^[\w-]{32}$/);
    const session = await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'W-1' } });
    expect(session?.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(session?.tokenHash).not.toContain(token);
    const responses = answersOf(start.body.items as Item[], { kSmall: 0.05, kLarge: 0.01 });
    const served = await probe(s.study.id, { participantId: 'W-1', responses, itemBankId: start.body.itemBankId }, { secret: browser.secret, origin: LAB, token });
    expect(served.status).toBe(200);
    expect(served.headers.get('access-control-allow-origin')).toBe(LAB);
    const items = served.body.items as Item[];
    const done = await answers(s.study.id, { participantId: 'W-1', answers: items.map((i) => ({ itemId: i.id, chosen: 'later', sideShown: i.soonerSide })) }, { secret: browser.secret, origin: LAB, token });
    expect([done.status, done.body.status]).toEqual([200, 'completed']);
    // resume after a reload: the same token gets the block again, without a new token
    const resumed = await calibration(s.study.id, '?participantId=W-1', { secret: browser.secret, origin: LAB, token });
    expect(resumed.status).toBe(200);
    expect(resumed.body.sessionToken).toBeUndefined();
  });

  it('cannot act as another participant: no token or a wrong one is 403, a second start is 409', async () => {
    const first = await calibration(s.study.id, '?participantId=W-2', { secret: browser.secret, origin: LAB });
    const responses = answersOf(first.body.items as Item[], { kSmall: 0.05, kLarge: 0.01 });
    const again = await calibration(s.study.id, '?participantId=W-2', { secret: browser.secret, origin: LAB });
    expect(again.status).toBe(409);
    expect(again.headers.get('access-control-allow-origin')).toBe(LAB);
    expect((await probe(s.study.id, { participantId: 'W-2', responses }, { secret: browser.secret, origin: LAB })).status).toBe(403);
    expect((await probe(s.study.id, { participantId: 'W-2', responses }, { secret: browser.secret, origin: LAB, token: 'not-the-token' })).status).toBe(403);
    const otherStart = await calibration(s.study.id, '?participantId=W-3', { secret: browser.secret, origin: LAB });
    expect((await probe(s.study.id, { participantId: 'W-2', responses }, { secret: browser.secret, origin: LAB, token: otherStart.body.sessionToken as string })).status).toBe(403);
    // a participant started through a server key has no token: a browser key cannot take it over
    await calibration(s.study.id, '?participantId=W-server', { secret: s.server.secret });
    expect((await calibration(s.study.id, '?participantId=W-server', { secret: browser.secret, origin: LAB })).status).toBe(409);
    expect((await calibration(s.study.id, '', { secret: browser.secret, origin: LAB })).status).toBe(422);
  });

  it('is refused from an unlisted origin and without an origin, and the refusal is not readable there', async () => {
    const elsewhere = await calibration(s.study.id, '?participantId=W-4', { secret: browser.secret, origin: ELSEWHERE });
    expect(elsewhere.status).toBe(403);
    expect(elsewhere.headers.get('access-control-allow-origin')).toBeNull();
    const bare = await calibration(s.study.id, '?participantId=W-4', { secret: browser.secret });
    expect(bare.status).toBe(403);
    expect(await ParticipantSession.count({ where: { studyId: s.study.id, participantId: 'W-4' } })).toBe(0);
    // a server key without origins is not usable from a browser page either
    expect((await calibration(s.study.id, '', { secret: s.server.secret, origin: LAB })).status).toBe(403);
  });

  it('carries the CORS headers on 401, 409, 422 and 429 replies to a listed origin', async () => {
    const unauthorised = await answers(s.study.id, { participantId: 'W-1', answers: [] }, { origin: LAB });
    expect([unauthorised.status, unauthorised.headers.get('access-control-allow-origin')]).toEqual([401, LAB]);
    const start = await calibration(s.study.id, '?participantId=W-5', { secret: browser.secret, origin: LAB });
    const token = start.body.sessionToken as string;
    const invalid = await answers(s.study.id, { participantId: 'W-5', answers: [{ itemId: 'x', chosen: 'later' }] }, { secret: browser.secret, origin: LAB, token });
    expect([invalid.status, invalid.headers.get('access-control-allow-origin')]).toEqual([422, LAB]);
    const responses = answersOf(start.body.items as Item[], { kSmall: 0.05, kLarge: 0.01 });
    const items = (await probe(s.study.id, { participantId: 'W-5', responses }, { secret: browser.secret, origin: LAB, token })).body.items as Item[];
    await answers(s.study.id, { participantId: 'W-5', answers: [{ itemId: items[0].id, chosen: 'later' }] }, { secret: browser.secret, origin: LAB, token });
    const conflict = await answers(s.study.id, { participantId: 'W-5', answers: [{ itemId: items[0].id, chosen: 'sooner' }] }, { secret: browser.secret, origin: LAB, token });
    expect([conflict.status, conflict.headers.get('access-control-allow-origin')]).toEqual([409, LAB]);
    const { capacity, perSecond } = browserRateLimiter;
    browserRateLimiter.capacity = 1;
    browserRateLimiter.perSecond = 0.01;
    browserRateLimiter.reset();
    try {
      await answers(s.study.id, { participantId: 'W-5', answers: [] }, { secret: browser.secret, origin: LAB, token });
      const limited = await answers(s.study.id, { participantId: 'W-5', answers: [] }, { secret: browser.secret, origin: LAB, token });
      expect([limited.status, limited.headers.get('access-control-allow-origin')]).toEqual([429, LAB]);
      expect(limited.headers.get('access-control-expose-headers')).toContain('Retry-After');
      // the browser key's budget is its own: the server key is not limited by it
      expect((await calibration(s.study.id, '', { secret: s.server.secret })).status).toBe(200);
    } finally {
      browserRateLimiter.capacity = capacity;
      browserRateLimiter.perSecond = perSecond;
      browserRateLimiter.reset();
    }
  });

  it('answers preflights for listed origins only', async () => {
    const pre = async (handler: unknown, origin: string) => {
      const response = await (handler as (r: never, c: never) => Promise<Response>)(
        (await requestAs(null, 'OPTIONS', `/api/v1/studies/${s.study.id}/stage2-answers`, { headers: { origin, 'access-control-request-method': 'POST', 'access-control-request-headers': 'authorization, content-type, x-session-token' } })) as never,
        ctx({ id: String(s.study.id) }) as never,
      );
      return response;
    };
    const listed = await pre(answersPreflight, LAB);
    expect(listed.status).toBe(204);
    expect(listed.headers.get('access-control-allow-origin')).toBe(LAB);
    expect(listed.headers.get('access-control-allow-methods')).toContain('POST');
    expect(listed.headers.get('access-control-allow-headers')?.toLowerCase()).toContain('x-session-token');
    const getPre = await pre(calibrationPreflight, LAB);
    expect(getPre.headers.get('access-control-allow-methods')).toContain('GET');
    const unlisted = await pre(answersPreflight, ELSEWHERE);
    expect(unlisted.headers.get('access-control-allow-origin')).toBeNull();
  });
});
