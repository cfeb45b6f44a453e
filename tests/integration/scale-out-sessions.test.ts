// The session API behind several app processes sharing one Redis (REDIS_URL): two processes of
// their own answer it over HTTP as production does, and this test process is a third (it revokes
// keys through the app's route). A revocation anywhere is refused at once everywhere, and a key's
// rate limit (and the session page's per address and link) is one budget however its requests are spread.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { DELETE as revokeKey } from '@/app/api/studies/[id]/api-keys/[keyId]/route';
import { closeSharedRedis } from '@/lib/server/redis';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';
import { startTsx, testRedisUrl, type Child } from '../support/processes';
import { makeFrozenVersion } from './item-bank-support';

const BURST = 4;
let apps: Child[] = [];
let bases: string[] = [];
let studyId: number;
let versionId: number;
let operator: TestUser;

async function startApp(): Promise<{ app: Child; base: string }> {
  // a burst of 4 and a trickle of one token per 100 s: the test's requests never earn a new one
  const app = startTsx('tests/support/session-app.ts', [], {
    REDIS_URL: testRedisUrl(),
    PROBE_API_BURST: String(BURST),
    PROBE_API_PER_SECOND: '0.01',
    SESSION_PAGE_BURST: String(BURST),
    SESSION_PAGE_PER_SECOND: '0.01',
  });
  const [, port] = await app.waitFor(/listening on port (\d+)/);
  return { app, base: `http://127.0.0.1:${port}` };
}

async function newKey(name: string): Promise<{ id: number; secret: string }> {
  const reply = await createKey(await requestAs(operator, 'POST', `/api/studies/${studyId}/api-keys`, { json: { name, designVersionId: versionId, kind: 'server' } }), ctx({ id: String(studyId) }));
  expect(reply.status).toBe(201);
  const body = (await reply.json()) as { secret: string; key: { id: number } };
  return { id: body.key.id, secret: body.secret };
}

function calibration(base: string, secret: string) {
  return fetch(`${base}/api/v1/studies/${studyId}/calibration`, { headers: { authorization: `Bearer ${secret}` } });
}

beforeAll(async () => {
  process.env.REDIS_URL = testRedisUrl();
  await migrateUp();
  const { study, team } = await makeStudyWithTeam('Shared session state');
  studyId = study.id;
  operator = team.operator;
  versionId = (await makeFrozenVersion(study.id)).id;
  const started = await Promise.all([startApp(), startApp()]);
  apps = started.map((s) => s.app);
  bases = started.map((s) => s.base);
}, 120_000);

afterAll(async () => {
  await Promise.all(apps.map((a) => a.stop()));
  delete process.env.REDIS_URL;
  await closeSharedRedis();
});

describe('session API state shared through Redis', () => {
  it('refuses a key at once in every app process after it is revoked through another', async () => {
    const key = await newKey('Revoked elsewhere');
    // both processes have looked the key up and hold it in their caches as active
    for (const base of bases) expect((await calibration(base, key.secret)).status).toBe(200);
    const revoked = await revokeKey(await requestAs(operator, 'DELETE', `/api/studies/${studyId}/api-keys/${key.id}`), ctx({ id: String(studyId), keyId: String(key.id) }));
    expect(revoked.status).toBe(200);
    for (const base of bases) {
      const reply = await calibration(base, key.secret);
      expect(reply.status).toBe(401);
      expect(((await reply.json()) as { error: string }).error).toMatch(/revoked/);
    }
  });

  it('holds one rate-limit budget per key across app processes', async () => {
    const key = await newKey('Spread over two processes');
    const statuses: number[] = [];
    // the burst spread over both processes (2 + 2), then one more on each
    for (const base of [bases[0], bases[1], bases[0], bases[1], bases[0], bases[1]]) statuses.push((await calibration(base, key.secret)).status);
    expect(statuses).toEqual([200, 200, 200, 200, 429, 429]);
    const refused = await calibration(bases[0], key.secret);
    expect(refused.headers.get('retry-after')).toMatch(/^\d+$/);
  });

  it("holds the session page's budget per address and link across app processes", async () => {
    // a link that does not exist: each request still spends the budget before it is looked up (404)
    const slug = `no-such-link-${Date.now()}`;
    const statuses: number[] = [];
    for (const base of [bases[0], bases[1], bases[0], bases[1], bases[0], bases[1]]) statuses.push((await fetch(`${base}/api/session-page/${slug}`)).status);
    expect(statuses).toEqual([404, 404, 404, 404, 429, 429]);
    const refused = await fetch(`${bases[1]}/api/session-page/${slug}`);
    expect(refused.headers.get('retry-after')).toMatch(/^\d+$/);
    // another link has a budget of its own
    expect((await fetch(`${bases[0]}/api/session-page/${slug}-other`)).status).toBe(404);
  });
});
