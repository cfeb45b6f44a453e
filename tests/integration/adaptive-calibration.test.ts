// Adaptive calibration through the session API on the real MariaDB (issue 17): the next-item step
// (idempotent per participant and step, answers stored in adaptive_calibration_answers, 409 on a
// changed answer, 422 naming the field), a participant run to the end and served stage 2 from the
// posterior, a browser key with its origin and token, CORS on every reply, and the export that says
// the calibration block is adaptive and lists the candidate set.
import { beforeAll, describe, expect, it } from 'vitest';
import { AdaptiveCalibrationAnswer, Participant } from '@/db/models';
import { POST as nextRoute, OPTIONS as nextPreflight } from '@/app/api/v1/studies/[id]/calibration-next/route';
import { GET as calibrationRoute } from '@/app/api/v1/studies/[id]/calibration/route';
import { POST as probeRoute } from '@/app/api/v1/studies/[id]/probe-items/route';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { GET as exportRoute } from '@/app/api/studies/[id]/item-bank/[versionId]/export/route';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { demoContent, makeFrozenVersion } from './item-bank-support';

const LAB = 'http://lab.example.test:3141';
type Item = { id: string; magnitude: 'small' | 'large'; soonerAmount: number; laterAmount: number; laterDelay: number; text: string };
type Json = Record<string, unknown> & { error?: string; issues?: Array<{ path: string; message: string }> };

async function setUp(name: string, adaptive: { maxItems: number; targetSd: number } | null = { maxItems: 8, targetSd: 0 }) {
  const { study, team } = await makeStudyWithTeam(name);
  const base = demoContent();
  const content = adaptive ? { ...base, spec: { ...base.spec, calibration: { ...base.spec.calibration, adaptive } } } : base;
  const version = await makeFrozenVersion(study.id, content);
  const key = async (input: Record<string, unknown> = {}) => {
    const reply = await createKey(await requestAs(team.operator, 'POST', `/api/studies/${study.id}/api-keys`, { json: { name: 'Session software', designVersionId: version.id, ...input } }), ctx({ id: String(study.id) }));
    expect(reply.status).toBe(201);
    return (await reply.json()) as { key: { id: number }; secret: string };
  };
  return { study, team, version, server: await key(), key };
}

async function send(handler: unknown, method: string, path: string, studyId: number, options: { secret?: string; origin?: string; token?: string; json?: unknown }) {
  const headers: Record<string, string> = {};
  if (options.secret) headers.authorization = `Bearer ${options.secret}`;
  if (options.origin) headers.origin = options.origin;
  if (options.token) headers['x-session-token'] = options.token;
  const response = await (handler as (r: Request, c: unknown) => Promise<Response>)(await requestAs(null, method, path, { json: options.json, headers }), ctx({ id: String(studyId) }));
  const text = await response.text();
  return { status: response.status, headers: response.headers, body: (text ? JSON.parse(text) : {}) as Json };
}

const next = (studyId: number, json: unknown, options: { secret?: string; origin?: string; token?: string } = {}) =>
  send(nextRoute, 'POST', `/api/v1/studies/${studyId}/calibration-next`, studyId, { ...options, json });

/** A noise-free hyperbolic chooser with these rates. */
function choose(item: Item, rates = { kSmall: 0.05, kLarge: 0.01 }): 'sooner' | 'later' {
  const k = item.magnitude === 'small' ? rates.kSmall : rates.kLarge;
  return item.laterAmount / (1 + k * item.laterDelay) > item.soonerAmount ? 'later' : 'sooner';
}

describe('the next calibration item step', () => {
  beforeAll(migrateUp);

  it('runs a participant to the end, one idempotent step at a time, and serves stage 2 from the posterior', async () => {
    const s = await setUp('Adaptive run');
    const first = await next(s.study.id, { participantId: 'A-1', step: 0 }, { secret: s.server.secret });
    expect(first.status, JSON.stringify(first.body)).toBe(200);
    expect(first.body).toMatchObject({ participantId: 'A-1', step: 0, answered: 0, done: false });
    expect((await next(s.study.id, { participantId: 'A-1', step: 0 }, { secret: s.server.secret })).body).toEqual(first.body);
    let reply = first;
    const asked: string[] = [];
    for (let step = 1; step <= 8; step++) {
      const item = reply.body.item as Item;
      asked.push(item.id);
      const answer = { itemId: item.id, chosen: choose(item) };
      reply = await next(s.study.id, { participantId: 'A-1', step, answer }, { secret: s.server.secret });
      expect(reply.status, JSON.stringify(reply.body)).toBe(200);
      // the same step again: the same reply, nothing written
      const again = await next(s.study.id, { participantId: 'A-1', step, answer }, { secret: s.server.secret });
      expect(again.body).toEqual(reply.body);
      expect(await AdaptiveCalibrationAnswer.count({ where: { studyId: s.study.id, participantId: 'A-1' } })).toBe(step);
    }
    expect(new Set(asked).size).toBe(8);
    expect(reply.body).toMatchObject({ done: true, reason: 'max-items', item: null, answered: 8 });
    const estimates = reply.body.estimates as { kSmall: { rate: number; interval: { lower: number; upper: number } }; kLarge: { rate: number } };
    expect(estimates.kSmall.interval.lower).toBeLessThan(estimates.kSmall.rate);
    expect(String(reply.body.caution)).toContain('not a clinical assessment');
    const served = await send(probeRoute, 'POST', `/api/v1/studies/${s.study.id}/probe-items`, s.study.id, { secret: s.server.secret, json: { participantId: 'A-1', responses: reply.body.responses } });
    expect(served.status, JSON.stringify(served.body)).toBe(200);
    const servedEstimates = served.body.estimates as { kSmall: { rate: number }; kLarge: { rate: number } };
    expect(servedEstimates.kSmall.rate).toBeCloseTo(estimates.kSmall.rate, 12);
    expect(servedEstimates.kLarge.rate).toBeCloseTo(estimates.kLarge.rate, 12);
    expect(await Participant.count({ where: { studyId: s.study.id, participantId: 'A-1' } })).toBe(1);
    // after the end, a further answer is refused naming the field
    const late = await next(s.study.id, { participantId: 'A-1', step: 9, answer: { itemId: asked[0], chosen: 'later' } }, { secret: s.server.secret });
    expect(late.status).toBe(422);
    expect(late.body.issues?.[0].path).toBe('answer');
  });

  it('keeps the first answer of a step (409), and answers 422 naming step, answer.itemId, answer and calibration', async () => {
    const s = await setUp('Adaptive refusals');
    const first = await next(s.study.id, { participantId: 'B-1', step: 0 }, { secret: s.server.secret });
    const item = first.body.item as Item;
    expect((await next(s.study.id, { participantId: 'B-1', step: 1, answer: { itemId: item.id, chosen: 'later' } }, { secret: s.server.secret })).status).toBe(200);
    const changed = await next(s.study.id, { participantId: 'B-1', step: 1, answer: { itemId: item.id, chosen: 'sooner' } }, { secret: s.server.secret });
    expect(changed.status).toBe(409);
    expect((await AdaptiveCalibrationAnswer.findOne({ where: { studyId: s.study.id, participantId: 'B-1', step: 0 } }))?.chosen).toBe('later');
    const ahead = await next(s.study.id, { participantId: 'B-1', step: 3, answer: { itemId: item.id, chosen: 'later' } }, { secret: s.server.secret });
    expect(ahead.status).toBe(422);
    expect(ahead.body.issues?.[0].path).toBe('step');
    const wrongItem = await next(s.study.id, { participantId: 'B-1', step: 2, answer: { itemId: item.id, chosen: 'later' } }, { secret: s.server.secret });
    expect(wrongItem.status).toBe(422);
    expect(wrongItem.body.issues?.[0].path).toBe('answer.itemId');
    for (const [body, path] of [
      [{ participantId: 'B-1', step: 1 }, 'answer'],
      [{ participantId: 'B-1', step: 0, answer: { itemId: item.id, chosen: 'later' } }, 'answer'],
      [{ participantId: 'B-1', step: -1 }, 'step'],
      [{ participantId: 'B 1', step: 0 }, 'participantId'],
      [{ participantId: 'B-1', step: 1, answer: { itemId: item.id, chosen: 'maybe' } }, 'answer.chosen'],
      [{ participantId: 'B-1', step: 0, colour: 'red' }, '(body)'],
    ] as const) {
      const bad = await next(s.study.id, body, { secret: s.server.secret });
      expect(bad.status, JSON.stringify(body)).toBe(422);
      if (path !== '(body)') expect(bad.body.issues?.map((i) => i.path), JSON.stringify(body)).toContain(path);
    }
    const fixed = await setUp('Adaptive fixed design', null);
    const notAdaptive = await next(fixed.study.id, { participantId: 'C-1', step: 0 }, { secret: fixed.server.secret });
    expect(notAdaptive.status).toBe(422);
    expect(notAdaptive.body.issues?.[0].path).toBe('calibration');
    expect((await next(s.study.id, { participantId: 'B-1', step: 0 }, {})).status).toBe(401);
    expect((await next(s.study.id, { participantId: 'B-1', step: 0 }, { secret: fixed.server.secret })).status).toBe(404);
  });

  it('records one row when the same step arrives ten times at once', async () => {
    const s = await setUp('Adaptive parallel');
    const item = (await next(s.study.id, { participantId: 'D-1', step: 0 }, { secret: s.server.secret })).body.item as Item;
    const replies = await Promise.all(Array.from({ length: 10 }, () => next(s.study.id, { participantId: 'D-1', step: 1, answer: { itemId: item.id, chosen: 'sooner' } }, { secret: s.server.secret })));
    expect(replies.map((r) => r.status)).toEqual(Array(10).fill(200));
    expect(new Set(replies.map((r) => JSON.stringify(r.body))).size).toBe(1);
    expect(await AdaptiveCalibrationAnswer.count({ where: { studyId: s.study.id, participantId: 'D-1' } })).toBe(1);
  });

  it('lets a browser key step only from its origin and with the participant’s session token, with CORS on every reply', async () => {
    const s = await setUp('Adaptive browser');
    const browser = await s.key({ name: 'Public page', kind: 'browser', allowedOrigins: [LAB] });
    const start = await send(calibrationRoute, 'GET', `/api/v1/studies/${s.study.id}/calibration?participantId=W-1`, s.study.id, { secret: browser.secret, origin: LAB });
    const token = String(start.body.sessionToken);
    const noToken = await next(s.study.id, { participantId: 'W-1', step: 0 }, { secret: browser.secret, origin: LAB });
    expect(noToken.status).toBe(403);
    expect(noToken.headers.get('access-control-allow-origin')).toBe(LAB);
    const ok = await next(s.study.id, { participantId: 'W-1', step: 0 }, { secret: browser.secret, origin: LAB, token });
    expect(ok.status).toBe(200);
    expect(ok.headers.get('access-control-allow-origin')).toBe(LAB);
    expect((await next(s.study.id, { participantId: 'W-1', step: 0 }, { secret: browser.secret, origin: 'http://elsewhere.example.test', token })).status).toBe(403);
    const preflight = await (nextPreflight as unknown as (r: Request, c: unknown) => Promise<Response>)(
      await requestAs(null, 'OPTIONS', `/api/v1/studies/${s.study.id}/calibration-next`, { headers: { origin: LAB, 'access-control-request-method': 'POST' } }),
      ctx({ id: String(s.study.id) }),
    );
    expect(preflight.status).toBe(204);
    expect(preflight.headers.get('access-control-allow-origin')).toBe(LAB);
  });
});

describe('the export of an adaptive design', () => {
  it('says the calibration block is adaptive and lists the candidate set (JSON and annotated CSV)', async () => {
    const s = await setUp('Adaptive export', { maxItems: 12, targetSd: 0.3 });
    const exported = async (format: string) =>
      exportRoute(await requestAs(s.team.operator, 'GET', `/api/studies/${s.study.id}/item-bank/${s.version.id}/export?format=${format}`), ctx({ id: String(s.study.id), versionId: String(s.version.id) }));
    const json = (await (await exported('json')).json()) as { adaptiveCalibration: { rule: string; maxItems: number; candidateCount: number; candidates: Item[] } };
    expect(json.adaptiveCalibration).toMatchObject({ maxItems: 12, targetSd: 0.3 });
    expect(json.adaptiveCalibration.candidateCount).toBeGreaterThanOrEqual(500);
    expect(json.adaptiveCalibration.candidates).toHaveLength(json.adaptiveCalibration.candidateCount);
    expect(json.adaptiveCalibration.rule).toContain('adaptive');
    const csv = await (await exported('csv-annotated')).text();
    expect(csv).toContain('Calibration is adaptive');
    expect(csv.split('\n').filter((line) => line.includes(',candidate,')).length).toBe(json.adaptiveCalibration.candidateCount);
    const step = await next(s.study.id, { participantId: 'E-1', step: 0 }, { secret: s.server.secret });
    expect(json.adaptiveCalibration.candidates.map((c) => c.id)).toContain((step.body.item as Item).id);
  });
});
