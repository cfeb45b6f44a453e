import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { GET as health } from '@/app/api/health/route';
import { GET as listStudies } from '@/app/api/studies/route';
import { startDatabase, stopDatabase } from '@/scripts/mariadb.mjs';
import { handleProbeItems } from '@/lib/server/http/probe-endpoint';
import { ctx, makeUser, migrateUp, requestAs, type TestUser } from '../support/integration';

let user: TestUser;

beforeAll(async () => {
  await migrateUp();
  user = await makeUser('outage');
});

afterAll(async () => {
  // Whatever happened above, leave the test database running for the next file.
  await startDatabase({ instance: 'test', log: () => {} });
});

// Stopping the server is only ours to do with the private test server (not with TEST_DB_HOST).
describe.skipIf(Boolean(process.env.TEST_DB_HOST))('when the database goes away', () => {
  it('answers 503 "database unavailable", then recovers by itself when it is back', async () => {
    const before = await listStudies(await requestAs(user, 'GET', '/api/studies'), ctx({}));
    expect(before.status).toBe(200);

    await stopDatabase({ instance: 'test' });
    const during = await listStudies(await requestAs(user, 'GET', '/api/studies'), ctx({}));
    expect(during.status).toBe(503);
    expect(await during.json()).toEqual({ error: 'database unavailable' });
    expect((await health()).status).toBe(503);
    // the probe-items API (Next route and the production server's direct path alike): a key not
    // cached yet has to be looked up, and the lookup finds no database
    const probe = await handleProbeItems({ studyId: '1', authorization: 'Bearer sbk_outage_key', readBody: async () => '{}' });
    expect([probe.status, probe.headers['Retry-After'], JSON.parse(probe.body)]).toEqual([503, '5', { error: 'database unavailable' }]);

    await startDatabase({ instance: 'test', log: () => {} });
    let after = 0;
    for (let attempt = 0; attempt < 20 && after !== 200; attempt++) {
      after = (await listStudies(await requestAs(user, 'GET', '/api/studies'), ctx({}))).status;
      if (after !== 200) await new Promise((r) => setTimeout(r, 500));
    }
    expect(after).toBe(200);
  }, 120_000);
});
