// The session API when the Redis that REDIS_URL names goes away and comes back. This test starts a
// Redis server of its own (on a free loopback port; the shared test Redis is left alone), an app
// process answering the API as production does (lib/server/http/direct-api.ts), and also calls the
// Next route in this process. While Redis is down every call is refused with 503, Retry-After, a
// JSON error and the key's CORS headers, the app logs the outage once and stays up; once Redis is
// back the same calls succeed.
import { spawn, type ChildProcess } from 'node:child_process';
import * as fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { GET as calibrationRoute } from '@/app/api/v1/studies/[id]/calibration/route';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { closeSharedRedis } from '@/lib/server/redis';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { startTsx, type Child } from '../support/processes';
import { makeFrozenVersion } from './item-bank-support';

const LAB = 'http://lab.example.test:3141';
let redisPort = 0;
let redisDir = '';
let redis: ChildProcess | null = null;
let app: Child;
let base = '';
let studyId: number;
let secret = '';

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

/** Starts this test's own Redis (Debian's redis-server, no persistence) and waits until it answers. */
async function startOwnRedis(): Promise<void> {
  redis = spawn('redis-server', ['--port', String(redisPort), '--bind', '127.0.0.1', '--save', '', '--appendonly', 'no', '--dir', redisDir], { stdio: 'ignore' });
  const deadline = Date.now() + 15_000;
  for (;;) {
    const up = await new Promise<boolean>((resolve) => {
      const socket = net.connect(redisPort, '127.0.0.1', () => socket.end(() => resolve(true)));
      socket.once('error', () => resolve(false));
    });
    if (up) return;
    if (Date.now() > deadline) throw new Error(`redis-server did not listen on ${redisPort}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

async function stopOwnRedis(): Promise<void> {
  const child = redis;
  redis = null;
  if (!child || child.exitCode !== null) return;
  const exited = new Promise((resolve) => child.once('exit', resolve));
  child.kill('SIGTERM');
  await exited;
}

function directCalibration(participant: string) {
  return fetch(`${base}/api/v1/studies/${studyId}/calibration?participantId=${participant}`, { headers: { authorization: `Bearer ${secret}`, origin: LAB } });
}

async function nextCalibration(participant: string) {
  const path = `/api/v1/studies/${studyId}/calibration?participantId=${participant}`;
  return calibrationRoute((await requestAs(null, 'GET', path, { headers: { authorization: `Bearer ${secret}`, origin: LAB } })) as never, ctx({ id: String(studyId) }) as never);
}

/** Calls `call` until it answers 200 (the clients reconnect within about a second), at most 15 s. */
async function until200(call: () => Promise<Response>): Promise<Response> {
  const deadline = Date.now() + 15_000;
  for (;;) {
    const reply = await call();
    if (reply.status === 200 || Date.now() > deadline) return reply;
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
}

beforeAll(async () => {
  redisPort = await freePort();
  redisDir = fs.mkdtempSync(path.join(os.tmpdir(), 'switchback-redis-outage-'));
  await startOwnRedis();
  process.env.REDIS_URL = `redis://127.0.0.1:${redisPort}`;
  await migrateUp();
  const { study, team } = await makeStudyWithTeam('Redis outage');
  studyId = study.id;
  const version = await makeFrozenVersion(study.id);
  const reply = await createKey(
    await requestAs(team.operator, 'POST', `/api/studies/${study.id}/api-keys`, { json: { name: 'Public page', designVersionId: version.id, kind: 'browser', allowedOrigins: [LAB] } }),
    ctx({ id: String(study.id) }),
  );
  expect(reply.status).toBe(201);
  secret = ((await reply.json()) as { secret: string }).secret;
  app = startTsx('tests/support/session-app.ts', [], { REDIS_URL: process.env.REDIS_URL });
  const [, port] = await app.waitFor(/listening on port (\d+)/);
  base = `http://127.0.0.1:${port}`;
}, 120_000);

afterAll(async () => {
  await app?.stop();
  delete process.env.REDIS_URL;
  await closeSharedRedis();
  await stopOwnRedis();
  fs.rmSync(redisDir, { recursive: true, force: true });
});

async function expectRefused(reply: Response) {
  expect(reply.status).toBe(503);
  expect(reply.headers.get('retry-after')).toMatch(/^[1-9]\d*$/);
  expect(reply.headers.get('access-control-allow-origin')).toBe(LAB);
  expect(reply.headers.get('content-type')).toMatch(/application\/json/);
  expect(((await reply.json()) as { error: string }).error).toMatch(/Redis.*cannot be reached.*Retry/);
}

describe('session API while its Redis is unreachable', () => {
  it('answers 503 with Retry-After and CORS while Redis is down, logs it once, and recovers when it is back', async () => {
    expect((await directCalibration('p-before')).status).toBe(200);
    expect((await nextCalibration('p-before-next')).status).toBe(200);

    await stopOwnRedis();
    for (let i = 0; i < 3; i++) await expectRefused(await directCalibration(`p-down-${i}`));
    for (let i = 0; i < 2; i++) await expectRefused(await nextCalibration(`p-down-next-${i}`));
    // the app process is still up, and said once (not per request or per reconnection attempt) why
    await new Promise((resolve) => setTimeout(resolve, 1500));
    expect(app.process.exitCode).toBeNull();
    expect(app.output().match(/Redis \(request\) at \S+ cannot be reached/g)).toHaveLength(1);
    expect(app.output()).not.toMatch(/unexpected error/);

    await startOwnRedis();
    const direct = await until200(() => directCalibration('p-after'));
    expect(direct.status).toBe(200);
    expect(direct.headers.get('access-control-allow-origin')).toBe(LAB);
    expect((await until200(() => nextCalibration('p-after-next'))).status).toBe(200);
    expect(app.output()).toMatch(/Redis \(request\) at \S+ is reachable again/);
  }, 90_000);
});
