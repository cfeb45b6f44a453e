// Every API route file is found by walking app/api; each exported method must have an entry in the
// permission matrix, and each entry is checked against the handler's real answers for anonymous,
// a signed-in non-member and every study role, on the real MariaDB.
import { readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { apiPermissions, type Access, type Method } from '@/lib/server/auth/permissions';
import { ROLES, roleAtLeast, type Role } from '@/lib/shared/roles';
import { ApiKey } from '@/db/models';
import { hashSecret } from '@/lib/server/services/api-keys';
import { ctx, makeStudyWithTeam, makeUser, migrateUp, requestAs, type TestUser } from '../support/integration';
import { makeFrozenVersion } from './item-bank-support';

const METHODS: Method[] = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'];
const API_DIR = path.join(process.cwd(), 'app', 'api');

function findRouteFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((entry) => {
    const full = path.join(dir, entry);
    if (statSync(full).isDirectory()) return findRouteFiles(full);
    return entry === 'route.ts' ? [full] : [];
  });
}

const routes = findRouteFiles(API_DIR).map((file) => ({
  file,
  pattern: '/' + path.relative(path.join(process.cwd(), 'app'), path.dirname(file)).split(path.sep).join('/'),
}));

/**
 * A browser key of the study (the key kind shipped inside public pages), listing one origin. It
 * must be refused everywhere but the participant-session endpoints, and there without its origin.
 */
async function browserKeyOf(studyId: number): Promise<string> {
  const version = await makeFrozenVersion(studyId);
  const secret = `sbk_matrix${studyId}_${'x'.repeat(32)}`;
  await ApiKey.create({ studyId, designVersionId: version.id, name: 'matrix browser key', prefix: `sbk_matrix${studyId}`.slice(0, 16), secretHash: hashSecret(secret), createdBy: null, lastUsedAt: null, revokedAt: null, revokedBy: null, kind: 'browser', allowedOrigins: ['http://lab.example.test'] });
  return secret;
}

/** Values for dynamic segments: the scratch study for [id], a catch-all sample, a missing id otherwise. */
function paramsFor(pattern: string, studyId: number): { url: string; params: Record<string, string | string[]> } {
  const params: Record<string, string | string[]> = {};
  const url = pattern.replace(/\[(\.\.\.)?([^\]]+)\]/g, (_m, rest: string | undefined, name: string) => {
    if (rest) {
      params[name] = ['providers'];
      return 'providers';
    }
    const value = name === 'id' ? String(studyId) : '999999999';
    params[name] = value;
    return value;
  });
  return { url, params };
}

type Handler = (request: unknown, context: unknown) => Promise<Response>;

async function call(handler: Handler, user: TestUser | null, method: Method, url: string, params: Record<string, string | string[]>, headers: Record<string, string> = {}) {
  const withBody = method === 'POST' || method === 'PUT' || method === 'PATCH';
  const request = await requestAs(user, method, url, withBody ? { json: {}, headers } : { headers });
  const response = await handler(request, ctx(params));
  return response.status;
}

describe('the permission matrix', () => {
  beforeAll(migrateUp);

  it('finds every API route by walking app/api, and the matrix lists exactly those routes', () => {
    // Both directions: a route file without an entry fails below, and an entry naming no route
    // file (a route moved or deleted, its permission left behind) fails here.
    expect(routes.map((r) => r.pattern).sort()).toEqual(Object.keys(apiPermissions).sort());
  });

  for (const { file, pattern } of routes) {
    it(`lists every method of ${pattern}`, async () => {
      const mod = (await import(pathToFileURL(file).href)) as Record<string, unknown>;
      const exported = METHODS.filter((m) => typeof mod[m] === 'function');
      const entry = apiPermissions[pattern];
      expect(entry, `${pattern} has no entry in lib/server/auth/permissions.ts`).toBeDefined();
      expect(Object.keys(entry ?? {}).sort()).toEqual([...exported].sort());
    });
  }

  const cases = routes.flatMap(({ file, pattern }) =>
    Object.entries(apiPermissions[pattern] ?? {}).map(([method, access]) => ({ file, pattern, method: method as Method, access: access as Access })),
  );

  for (const { file, pattern, method, access } of cases) {
    if (pattern.startsWith('/api/auth/')) continue; // next-auth's own endpoints, exercised by the sign-in tests
    it(`${method} ${pattern} (${access}) answers each caller as the matrix says`, async () => {
      const handler = ((await import(pathToFileURL(file).href)) as Record<string, Handler>)[method];
      const { study, team, outsider } = await makeStudyWithTeam(`Matrix ${method} ${pattern}`);
      const { url, params } = paramsFor(pattern, study.id);

      const anonymous = await call(handler, null, method, url, params);
      if (access === 'public') {
        expect(anonymous, 'a public route must not ask for sign-in').not.toBe(401);
        return;
      }
      expect(anonymous, 'anonymous callers get 401').toBe(401);
      const browserKey = { authorization: `Bearer ${await browserKeyOf(study.id)}` };

      if (access === 'api-key') {
        expect(await call(handler, outsider, method, url, params), 'a browser session is not an API key').toBe(401);
        expect(await call(handler, null, method, url, params, browserKey), 'a browser key works only from its listed origins').toBe(403);
        expect(await call(handler, null, method, url, params, { ...browserKey, origin: 'http://unlisted.example.test' }), 'a browser key works only from its listed origins').toBe(403);
        return;
      }
      expect(await call(handler, null, method, url, params, browserKey), 'a browser key is refused outside the participant-session API').toBe(401);
      expect(await call(handler, null, method, url, params, { ...browserKey, origin: 'http://lab.example.test' }), 'a browser key is refused outside the participant-session API').toBe(401);
      if (access === 'signed-in') {
        expect([401, 403, 404]).not.toContain(await call(handler, outsider, method, url, params));
        return;
      }
      expect(await call(handler, outsider, method, url, params), 'non-members get 404 so the study does not leak').toBe(404);
      // Least privileged first, so a destructive call by the owner comes last.
      for (const role of ROLES as readonly Role[]) {
        const status = await call(handler, team[role], method, url, params);
        if (roleAtLeast(role, access)) expect([401, 403], `${role} may ${method} ${pattern} (got ${status})`).not.toContain(status);
        else expect(status, `${role} must be refused ${method} ${pattern}`).toBe(403);
      }
    });
  }

  it('refuses an unknown study id with 404 even for a signed-in user', async () => {
    const user = await makeUser('stranger');
    const { GET } = await import('@/app/api/studies/[id]/route');
    const response = await GET(await requestAs(user, 'GET', '/api/studies/424242424'), ctx({ id: '424242424' }));
    expect(response.status).toBe(404);
  });
});
