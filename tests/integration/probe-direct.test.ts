// handleProbeItems, the framework-free probe-items endpoint, on the real MariaDB: its statuses
// when called directly, and over real HTTP through answerDirect (the node:http path that
// scripts/serve.mjs runs in production), compared with what the Next route answers.
import { createServer, request as httpRequest, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Participant } from '@/db/models';
import { POST as probeRoute } from '@/app/api/v1/studies/[id]/probe-items/route';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { DELETE as revokeKey } from '@/app/api/studies/[id]/api-keys/[keyId]/route';
import { answerDirect } from '@/lib/server/http/direct-api';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { handleProbeItems } from '@/lib/server/http/probe-endpoint';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';

async function setUp(name: string) {
  const { study, team } = await makeStudyWithTeam(name);
  const version = await makeFrozenVersion(study.id);
  const reply = await createKey(await requestAs(team.operator, 'POST', `/api/studies/${study.id}/api-keys`, { json: { name: 'Survey', designVersionId: version.id } }), ctx({ id: String(study.id) }));
  const { key, secret } = (await reply.json()) as { key: { id: number }; secret: string };
  const responses = answersOf(bankFor(version).bank.items, { kSmall: 0.05, kLarge: 0.01 });
  return { study, team, key, secret, responses };
}

let s: Awaited<ReturnType<typeof setUp>>;
let server: Server;
let base: string;

beforeAll(async () => {
  await migrateUp();
  s = await setUp('Direct probe study');
  server = createServer((req, res) => {
    if (!answerDirect(req, res)) res.writeHead(599).end('not direct'); // what scripts/serve.mjs hands to Next
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  await new Promise((resolve) => server?.close(resolve));
});

const call = (body: string, authorization: string | null = `Bearer ${s.secret}`, studyId = String(s.study.id)) =>
  handleProbeItems({ studyId, authorization, readBody: async () => body });

describe('handleProbeItems', () => {
  it('maps every refusal to its status and message', async () => {
    const ok = JSON.stringify({ participantId: 'H-1', responses: s.responses });
    const missing = await call(ok, null);
    expect([missing.status, JSON.parse(missing.body).error]).toEqual([401, 'Send the study\'s API key as "Authorization: Bearer <key>".']);
    const unknown = await call(ok, 'Bearer sbk_unknown_key');
    expect([unknown.status, JSON.parse(unknown.body).error]).toEqual([401, 'This API key is unknown or has been revoked.']);
    expect((await call(ok, `Bearer ${s.secret}`, String(s.study.id + 100_000))).status).toBe(404);
    expect((await call(ok, `Bearer ${s.secret}`, 'abc')).status).toBe(404);
    expect((await call('{"participantId":')).status).toBe(400);
    const invalid = await call(JSON.stringify({ participantId: 'H-2', responses: { 'no-such-item': 'later' }, extra: 1 }));
    expect(invalid.status).toBe(422);
    expect(JSON.parse(invalid.body).issues.map((i: { path: string }) => i.path)).toEqual(expect.arrayContaining(['(body)']));
    expect(await Participant.count({ where: { studyId: s.study.id } })).toBe(0);
  });

  it('does not read the body of a caller it refuses', async () => {
    let read = false;
    const reply = await handleProbeItems({ studyId: String(s.study.id), authorization: null, readBody: async () => ((read = true), '{}') });
    expect(reply.status).toBe(401);
    expect(read).toBe(false);
  });

  it('serves a participant once and replays the stored reply', async () => {
    const body = JSON.stringify({ participantId: 'H-3', responses: s.responses });
    const first = await call(body);
    expect(first.status).toBe(200);
    expect(first.headers['content-type']).toBe('application/json');
    expect((await call(body)).body).toBe(first.body);
    const flipped = { ...s.responses, 'cal-small-01': s.responses['cal-small-01'] === 'later' ? 'sooner' : 'later' };
    expect((await call(JSON.stringify({ participantId: 'H-3', responses: flipped }))).status).toBe(409);
  });
});

function post(path: string, body: string | Buffer | null, headers: Record<string, string> = {}, chunked = false) {
  return new Promise<{ status: number; headers: Record<string, string | string[] | undefined>; body: string }>((resolve, reject) => {
    const req = httpRequest(`${base}${path}`, { method: 'POST', headers: { 'content-type': 'application/json', ...headers } }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode!, headers: res.headers, body: Buffer.concat(chunks).toString('utf8') }));
    });
    req.on('error', reject);
    if (body === null) req.end();
    else if (chunked) {
      // streamed without a Content-Length: the size is only seen while reading
      const piece = Buffer.alloc(100_000, 0x20);
      for (let i = 0; i < 12; i++) req.write(piece);
      req.end();
    } else req.end(body);
  });
}

describe('the direct path over HTTP', () => {
  const path = () => `/api/v1/studies/${s.study.id}/probe-items`;
  const auth = () => ({ authorization: `Bearer ${s.secret}` });

  it('answers like the Next route, marked as direct', async () => {
    const body = JSON.stringify({ participantId: 'D-1', responses: s.responses });
    const direct = await post(path(), body, auth());
    expect(direct.status).toBe(200);
    expect(direct.headers['x-switchback-path']).toBe('direct');
    expect(direct.headers['content-type']).toBe('application/json');
    const viaNext = await probeRoute(await requestAs(null, 'POST', path(), { body, headers: { ...auth(), 'content-type': 'application/json' } }), ctx({ id: String(s.study.id) }));
    expect(viaNext.status).toBe(200);
    expect(await viaNext.text()).toBe(direct.body);
    expect(await Participant.count({ where: { studyId: s.study.id, participantId: 'D-1' } })).toBe(1);
  });

  it('answers 401, 400, 422 and 413 (declared or streamed) over HTTP', async () => {
    expect((await post(path(), '{}')).status).toBe(401);
    expect((await post(path(), '{', auth())).status).toBe(400);
    const invalid = await post(path(), JSON.stringify({ participantId: 'D-2', responses: { x: 'maybe' } }), auth());
    expect(invalid.status).toBe(422);
    expect(JSON.parse(invalid.body).issues.map((i: { path: string }) => i.path)).toEqual(expect.arrayContaining(['responses.x']));
    const declared = await post(path(), Buffer.alloc(1_000_001, 0x20), auth());
    expect([declared.status, JSON.parse(declared.body).error]).toEqual([413, 'The request body is larger than 1 MB.']);
    const streamed = await post(path(), '', auth(), true);
    expect(streamed.status).toBe(413);
  });

  it('serves 50 parallel requests about one participant with one record', async () => {
    const body = JSON.stringify({ participantId: 'D-parallel', responses: s.responses });
    const replies = await Promise.all(Array.from({ length: 50 }, () => post(path(), body, auth())));
    expect(replies.map((r) => r.status)).toEqual(Array(50).fill(200));
    expect(new Set(replies.map((r) => r.body)).size).toBe(1);
    expect(await Participant.count({ where: { studyId: s.study.id, participantId: 'D-parallel' } })).toBe(1);
  });

  it('refuses a key at once after it is revoked through the app', async () => {
    const other = await setUp('Direct revoked study');
    const p = `/api/v1/studies/${other.study.id}/probe-items`;
    const headers = { authorization: `Bearer ${other.secret}` };
    expect((await post(p, JSON.stringify({ participantId: 'V-1', responses: other.responses }), headers)).status).toBe(200);
    const revoked = await revokeKey(await requestAs(other.team.operator, 'DELETE', `/api/studies/${other.study.id}/api-keys/${other.key.id}`), ctx({ id: String(other.study.id), keyId: String(other.key.id) }));
    expect(revoked.status).toBe(200);
    expect((await post(p, JSON.stringify({ participantId: 'V-2', responses: { x: 'maybe' } }), headers)).status).toBe(401);
    expect((await post(p, JSON.stringify({ participantId: 'V-2', responses: other.responses }), headers)).status).toBe(401);
  });

  it('leaves other methods and paths to Next', async () => {
    expect((await post(`${path()}/`, '{}')).status).toBe(599);
    expect((await post(`/api/studies/${s.study.id}/api-keys`, '{}')).status).toBe(599);
    const get = await new Promise<number>((resolve, reject) => httpRequest(`${base}${path()}`, (res) => (res.resume(), resolve(res.statusCode!))).on('error', reject).end());
    expect(get).toBe(599);
  });
});
