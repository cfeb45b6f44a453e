// The session endpoints over real HTTP through answerDirect (the node:http path scripts/serve.mjs
// runs in production): preflights, the calibration block, probe items and stage-2 answers, each
// marked as direct and carrying the same CORS headers as the Next routes, refusals included.
import { createServer, request as httpRequest, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { answerDirect } from '@/lib/server/http/direct-api';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';

const LAB = 'http://lab.example.test:3143';
let server: Server;
let base: string;
let studyId: number;
let secret: string;

beforeAll(async () => {
  await migrateUp();
  const { study, team } = await makeStudyWithTeam('Direct session study');
  const version = await makeFrozenVersion(study.id);
  const reply = await createKey(await requestAs(team.operator, 'POST', `/api/studies/${study.id}/api-keys`, { json: { name: 'Page', designVersionId: version.id, kind: 'browser', allowedOrigins: [LAB] } }), ctx({ id: String(study.id) }));
  secret = ((await reply.json()) as { secret: string }).secret;
  studyId = study.id;
  server = createServer((req, res) => {
    if (!answerDirect(req, res)) res.writeHead(599).end('not direct');
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  await new Promise((resolve) => server?.close(resolve));
});

function send(method: string, path: string, headers: Record<string, string>, body?: unknown) {
  return new Promise<{ status: number; headers: Record<string, string | string[] | undefined>; body: Record<string, unknown> }>((resolve, reject) => {
    const req = httpRequest(`${base}${path}`, { method, headers: body === undefined ? headers : { 'content-type': 'application/json', ...headers } }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => {
        const text = Buffer.concat(chunks).toString('utf8');
        const json = (res.headers['content-type'] ?? '').includes('json');
        resolve({ status: res.statusCode!, headers: res.headers, body: json && text ? (JSON.parse(text) as Record<string, unknown>) : { text } });
      });
    });
    req.on('error', reject);
    req.end(body === undefined ? undefined : JSON.stringify(body));
  });
}

describe('the session endpoints on the direct path', () => {
  it('answers preflights of all three endpoints for a listed origin, and not for another', async () => {
    for (const [endpoint, method] of [['calibration', 'GET'], ['probe-items', 'POST'], ['stage2-answers', 'POST']] as const) {
      const pre = await send('OPTIONS', `/api/v1/studies/${studyId}/${endpoint}`, { origin: LAB, 'access-control-request-method': method });
      expect(pre.status).toBe(204);
      expect(pre.headers['x-switchback-path']).toBe('direct');
      expect(pre.headers['access-control-allow-origin']).toBe(LAB);
      expect(pre.headers['access-control-allow-methods']).toContain(method);
    }
    const other = await send('OPTIONS', `/api/v1/studies/${studyId}/calibration`, { origin: 'http://elsewhere.example.test' });
    expect(other.headers['access-control-allow-origin']).toBeUndefined();
  });

  it('runs a session with a browser key, every reply carrying the CORS headers', async () => {
    const headers = { authorization: `Bearer ${secret}`, origin: LAB };
    const start = await send('GET', `/api/v1/studies/${studyId}/calibration?participantId=DS-1`, headers);
    expect([start.status, start.headers['access-control-allow-origin'], start.headers['x-switchback-path']]).toEqual([200, LAB, 'direct']);
    const token = start.body.sessionToken as string;
    const items = start.body.items as Array<{ id: string; role: string; magnitude: string | null; soonerAmount: number; laterAmount: number; laterDelay: number }>;
    const served = await send('POST', `/api/v1/studies/${studyId}/probe-items`, { ...headers, 'x-session-token': token }, { participantId: 'DS-1', responses: answersOf(items, { kSmall: 0.05, kLarge: 0.01 }) });
    expect([served.status, served.headers['access-control-allow-origin']]).toEqual([200, LAB]);
    const stage2 = served.body.items as Array<{ id: string }>;
    const done = await send('POST', `/api/v1/studies/${studyId}/stage2-answers`, { ...headers, 'x-session-token': token }, { participantId: 'DS-1', answers: stage2.map((i) => ({ itemId: i.id, chosen: 'later' })) });
    expect([done.status, done.body.status, done.headers['access-control-allow-origin']]).toEqual([200, 'completed', LAB]);
    const unauthorised = await send('POST', `/api/v1/studies/${studyId}/stage2-answers`, { origin: LAB }, { participantId: 'DS-1', answers: [] });
    expect([unauthorised.status, unauthorised.headers['access-control-allow-origin']]).toEqual([401, LAB]);
    const noToken = await send('POST', `/api/v1/studies/${studyId}/stage2-answers`, headers, { participantId: 'DS-1', answers: [] });
    expect([noToken.status, noToken.headers['access-control-allow-origin']]).toEqual([403, LAB]);
  });

  it('leaves other methods to Next', async () => {
    expect((await send('DELETE', `/api/v1/studies/${studyId}/stage2-answers`, {})).status).toBe(599);
    expect((await send('POST', `/api/v1/studies/${studyId}/calibration`, {}, {})).status).toBe(599);
  });
});
