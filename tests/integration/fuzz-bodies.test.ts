// Thousands of odd JSON bodies against every state-changing route, from a seeded fast-check
// generator (the same bodies on every run): each is answered 2xx or 4xx, never 5xx. Routes are
// found by walking app/api, as the route-matrix test does; callers have the role each route asks
// for, and the ids in the path name real rows, so bodies reach the parsers and services.
import fc from 'fast-check';
import { randomBytes } from 'node:crypto';
import { readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { Invitation, PriorSet } from '@/db/models';
import { apiPermissions, type Method } from '@/lib/server/auth/permissions';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { demoContent, makeFrozenVersion } from './item-bank-support';

const SEED = 20261203;
const RUNS_PER_ROUTE = 60;
const API_DIR = path.join(process.cwd(), 'app', 'api');

function findRouteFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((entry) => {
    const full = path.join(dir, entry);
    if (statSync(full).isDirectory()) return findRouteFiles(full);
    return entry === 'route.ts' ? [full] : [];
  });
}

const writes = findRouteFiles(API_DIR)
  .map((file) => ({ file, pattern: '/' + path.relative(path.join(process.cwd(), 'app'), path.dirname(file)).split(path.sep).join('/') }))
  .filter(({ pattern }) => !pattern.startsWith('/api/auth/'))
  .flatMap(({ file, pattern }) =>
    Object.entries(apiPermissions[pattern] ?? {})
      .filter(([method]) => method !== 'GET')
      .map(([method, access]) => ({ file, pattern, method: method as Method, access })),
  );

// Field names the app's schemas use, so generated objects often get past "unknown field".
const KEYS = ['name', 'description', 'email', 'role', 'password', 'currentPassword', 'newPassword', 'token', 'text', 'version', 'spec', 'prior', 'model', 'id', 'sensitivity', 'presentBias', 'ratio', 'largeAmount', 'currency', 'mode', 'soonDelay', 'days', 'min', 'max', 'lateDelayLimit', 'probePairs', 'calibration', 'criterion', 'medianSmall', 'medianLarge', 'sdLogSmall', 'sdLogLarge', 'correlation', 'designVersionId', 'priorSetId', 'truth', 'gamma', 'lapse', 'test', 'kind', 'alpha', 'sampleSizes', 'replications', 'seed', 'label', 'csv', 'participantId', 'responses', 'answers', 'itemId', 'chosen', 'notices', 'kind', 'allowedOrigins'];
const number = fc.oneof(fc.double(), fc.integer(), fc.constantFrom(0, -1, 1e308, -1e308, 5e-324, 2 ** 53, 4294967296, 0.5));
const leaf = fc.oneof(number, fc.string(), fc.string({ unit: 'binary', maxLength: 20 }), fc.boolean(), fc.constant(null), fc.constantFrom('', ' ', '\u0000', '\ud800', '=1+1', 'owner', 'hyperbolic', 'EUR'));
const value = fc.letrec((tie) => ({
  node: fc.oneof({ depthSize: 'small', withCrossShrink: true }, leaf, fc.array(tie('node'), { maxLength: 4 }), fc.dictionary(fc.constantFrom(...KEYS), tie('node'), { maxKeys: 6 })),
})).node;
const body = fc.oneof(
  value.map((v) => JSON.stringify(v)),
  fc.jsonValue().map((v) => JSON.stringify(v)),
  fc.dictionary(fc.constantFrom(...KEYS), value, { minKeys: 1, maxKeys: 10 }).map((v) => JSON.stringify(v)),
  fc.string().map((s) => `{"name":${s}`),
  fc.constantFrom('', 'null', '[]', '{}', '{"__proto__":{"admin":true}}', '{"constructor":{"prototype":{}}}', '"\\ud800"', '1e999'),
);

beforeAll(migrateUp);

describe('fuzzed JSON bodies', () => {
  it('finds the state-changing routes', () => {
    expect(writes.length).toBeGreaterThanOrEqual(25);
  });

  for (const { file, pattern, method, access } of writes) {
    it(`${method} ${pattern} never answers 5xx`, async () => {
      const handler = ((await import(pathToFileURL(file).href)) as Record<string, (r: unknown, c: unknown) => Promise<Response>>)[method];
      const { study, team, outsider } = await makeStudyWithTeam(`Fuzz ${method} ${pattern}`);
      const version = await makeFrozenVersion(study.id, demoContent());
      const prior = await PriorSet.create({ studyId: study.id, name: 'Fuzz prior', values: demoContent().prior, source: 'manual', notes: '', createdBy: team.editor.id });
      const invitation = await Invitation.create({ studyId: study.id, email: 'fuzz@invitees.example.org', role: 'viewer', tokenHash: randomBytes(32).toString('hex'), invitedBy: team.owner.id, expiresAt: new Date(Date.now() + 86_400_000), acceptedAt: null, acceptedBy: null, revokedAt: null });
      const keyReply = await createKey(await requestAs(team.operator, 'POST', `/api/studies/${study.id}/api-keys`, { json: { name: 'Fuzz key', designVersionId: version.id } }), ctx({ id: String(study.id) }));
      const { key, secret } = (await keyReply.json()) as { key: { id: number }; secret: string };
      const ids: Record<string, string> = { id: String(study.id), designId: String(version.designId), priorId: String(prior.id), versionId: String(version.id), keyId: String(key.id), invitationId: String(invitation.id), userId: String(team.viewer.id), runId: '999999999', token: 'not-a-token' };
      const params: Record<string, string> = {};
      const url = pattern.replace(/\[([^\]]+)\]/g, (_m, name: string) => (params[name] = ids[name] ?? '1'));
      const caller = access === 'api-key' || access === 'public' ? null : access === 'signed-in' ? outsider : team.owner;
      const upload = pattern.endsWith('/priors/pilot');
      const seen: number[] = [];
      await fc.assert(
        fc.asyncProperty(body, async (text) => {
          const headers: Record<string, string> = { 'content-type': upload ? 'text/csv' : 'application/json', ...(access === 'api-key' ? { authorization: `Bearer ${secret}` } : {}) };
          const response = await handler(await requestAs(caller, method, url, { body: text, headers }), ctx(params));
          seen.push(response.status);
          return response.status < 500;
        }),
        { seed: SEED, numRuns: RUNS_PER_ROUTE, endOnFailure: true },
      );
      expect(seen.length).toBe(RUNS_PER_ROUTE);
    }, 60_000);
  }
});
