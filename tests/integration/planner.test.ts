import { beforeAll, describe, expect, it } from 'vitest';
import { GET as listPriors, POST as createPrior } from '@/app/api/studies/[id]/priors/route';
import { PUT as putPrior, DELETE as deletePrior } from '@/app/api/studies/[id]/priors/[priorId]/route';
import { POST as fitPilot } from '@/app/api/studies/[id]/priors/pilot/route';
import { GET as listDesigns, POST as createDesign } from '@/app/api/studies/[id]/designs/route';
import { GET as getDesign, PUT as putDesign, DELETE as deleteDesign } from '@/app/api/studies/[id]/designs/[designId]/route';
import { GET as getSummary } from '@/app/api/studies/[id]/designs/[designId]/summary/route';
import { POST as freeze } from '@/app/api/studies/[id]/designs/[designId]/freeze/route';
import { GET as listComments, POST as postComment } from '@/app/api/studies/[id]/designs/[designId]/comments/route';
import { POST as startRun } from '@/app/api/studies/[id]/power-runs/route';
import { GET as listVersions } from '@/app/api/studies/[id]/design-versions/route';
import { GET as getVersion } from '@/app/api/studies/[id]/design-versions/[versionId]/route';
import { AuditEvent, DesignVersion } from '@/db/models';
import { contentHash } from '@/lib/shared/canonical-json';
import { freezeDesign } from '@/lib/server/services/planner-designs';
import { defaultSpec } from '@/lib/shared/planner/design-form-values';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';

beforeAll(migrateUp);

const priorBody = { name: 'Canteen pilot', medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 };

async function setUp() {
  const { study, team, outsider } = await makeStudyWithTeam('Planner study');
  const id = String(study.id);
  const call = async (handler: (r: never, c: never) => Promise<Response>, user: TestUser | null, method: string, path: string, params: Record<string, string> = {}, options: Parameters<typeof requestAs>[3] = {}) => {
    const response = await handler((await requestAs(user, method, `/api/studies/${id}${path}`, options)) as never, ctx({ id, ...params }) as never);
    return { status: response.status, body: response.status === 204 ? null : await response.json() };
  };
  const prior = await call(createPrior, team.editor, 'POST', '/priors', {}, { json: priorBody });
  expect(prior.status).toBe(201);
  return { study, team, outsider, id, call, priorId: prior.body.prior.id as number };
}

describe('prior sets', () => {
  it('are created by editors, listed for viewers, and refused to viewers with 403', async () => {
    const { team, call } = await setUp();
    const listed = await call(listPriors, team.viewer, 'GET', '/priors');
    expect(listed.body.priors).toEqual([expect.objectContaining({ name: 'Canteen pilot', values: expect.objectContaining({ medianSmall: 0.02 }), version: 1 })]);
    expect((await call(createPrior, team.viewer, 'POST', '/priors', {}, { json: priorBody })).status).toBe(403);
  });

  it('answers bad values with 422 naming the field', async () => {
    const { team, call } = await setUp();
    const bad = await call(createPrior, team.editor, 'POST', '/priors', {}, { json: { ...priorBody, correlation: 2, sdLogSmall: -1 } });
    expect(bad.status).toBe(422);
    expect(bad.body.issues.map((i: { path: string }) => i.path)).toEqual(expect.arrayContaining(['correlation', 'sdLogSmall']));
  });

  it('refuse a stale save with 409 and keep the winner’s values', async () => {
    const { team, call, priorId } = await setUp();
    const params = { priorId: String(priorId) };
    const first = await call(putPrior, team.editor, 'PUT', `/priors/${priorId}`, params, { json: { prior: { ...priorBody, medianSmall: 0.03 }, version: 1 } });
    expect(first.status).toBe(200);
    const stale = await call(putPrior, team.owner, 'PUT', `/priors/${priorId}`, params, { json: { prior: { ...priorBody, medianSmall: 0.05 }, version: 1 } });
    expect(stale.status).toBe(409);
    const listed = await call(listPriors, team.viewer, 'GET', '/priors');
    expect(listed.body.priors[0]).toMatchObject({ values: { medianSmall: 0.03 }, version: 2 });
  });

  it('fit from a pilot CSV, listing bad lines and refusing files over 5 MB', async () => {
    const { team, call } = await setUp();
    const good = await call(fitPilot, team.editor, 'POST', '/priors/pilot', {}, { body: 'participant,kSmall,kLarge\na,0.02,0.01\nb,0.03,0.01\nc,0.01,0.005\n', headers: { 'content-type': 'text/csv' } });
    expect(good.status).toBe(200);
    expect(good.body).toMatchObject({ ok: true, rows: 3 });
    const bad = await call(fitPilot, team.editor, 'POST', '/priors/pilot', {}, { body: 'participant,kSmall,kLarge\na,0.02,0.01\nb,zero,0.01\n', headers: { 'content-type': 'text/csv' } });
    expect(bad.status).toBe(422);
    expect(bad.body.issues).toEqual([expect.objectContaining({ path: 'line 3: kSmall' })]);
    const huge = await call(fitPilot, team.editor, 'POST', '/priors/pilot', {}, { body: 'x'.repeat(5 * 1024 * 1024 + 10), headers: { 'content-type': 'text/csv' } });
    expect(huge.status).toBe(413);
  });

  it('fit from raw pilot choices under the model in the query, naming a bad model and a bad cell', async () => {
    const { team, call } = await setUp();
    const header = 'participant,magnitude,soonerAmount,soonerDelay,laterAmount,laterDelay,choice';
    // three people, two questions per reward size each, switching between them (interior estimates)
    const person = (p: string) => [`${p},small,50,0,100,7,later`, `${p},small,50,0,100,365,sooner`, `${p},large,500,0,1000,30,later`, `${p},large,500,0,1000,900,sooner`];
    const body = [header, ...['a', 'b', 'c'].flatMap(person)].join('\n');
    const fitted = await call(fitPilot, team.editor, 'POST', '/priors/pilot?model=exponential', {}, { body, headers: { 'content-type': 'text/csv' } });
    expect(fitted.status).toBe(200);
    expect(fitted.body).toMatchObject({ ok: true, rows: 3 });
    expect(fitted.body.notes[0]).toMatch(/under the exponential model/);
    const unknown = await call(fitPilot, team.editor, 'POST', '/priors/pilot?model=cubic', {}, { body, headers: { 'content-type': 'text/csv' } });
    expect(unknown.status).toBe(422);
    expect(unknown.body.issues.map((i: { path: string }) => i.path)).toEqual(['model']);
    const bad = await call(fitPilot, team.editor, 'POST', '/priors/pilot', {}, { body: `${header}\na,small,50,0,100,7,perhaps\n`, headers: { 'content-type': 'text/csv' } });
    expect(bad.status).toBe(422);
    expect(bad.body.issues).toEqual([{ path: 'line 2: choice', message: '"perhaps" is not sooner or later.' }]);
  });
});

describe('designs, summaries, freezing and comments', () => {
  it('computes the same summary on the server as the shared function does here', async () => {
    const { team, call, priorId } = await setUp();
    const spec = { ...defaultSpec('Fortnight', priorId), mode: 'population' as const, criterion: 'expected-reversal-rate' as const };
    const created = await call(createDesign, team.editor, 'POST', '/designs', {}, { json: spec });
    expect(created.status).toBe(201);
    const designId = String(created.body.design.id);
    const served = await call(getSummary, team.viewer, 'GET', `/designs/${designId}/summary`, { designId });
    expect(served.status).toBe(200);
    const { name: _name, ...values } = { ...priorBody };
    const local = JSON.parse(JSON.stringify(computeDesignSummary({ spec, prior: values })));
    expect(served.body.summary).toEqual(local);
  });

  it('refuses a design whose prior set is in another study, and bad fields, with 422', async () => {
    const { team, call } = await setUp();
    const other = await setUp();
    const wrongPrior = await call(createDesign, team.editor, 'POST', '/designs', {}, { json: defaultSpec('Stray', other.priorId) });
    expect(wrongPrior.status).toBe(422);
    expect(wrongPrior.body.issues[0].path).toBe('priorSetId');
    const bad = await call(createDesign, team.editor, 'POST', '/designs', {}, { json: { ...defaultSpec('Bad', 1), ratio: 1.5 } });
    expect(bad.status).toBe(422);
    expect(bad.body.issues.map((i: { path: string }) => i.path)).toContain('ratio');
  });

  it('plans strong present bias (β = 0.1) through to a power run, and refuses a β no question can measure with 422 naming spec.model.presentBias', async () => {
    const { team, call, priorId } = await setUp();
    const tiny = await call(createDesign, team.editor, 'POST', '/designs', {}, { json: { ...defaultSpec('Tiny β', priorId), model: { id: 'quasi-hyperbolic', presentBias: 1e-300 } } });
    expect(tiny.status).toBe(422);
    expect(tiny.body.issues.map((i: { path: string }) => i.path)).toEqual(['model.presentBias']);
    expect(tiny.body.issues[0].message).toMatch(/no choice could reveal a discount rate/);
    const model = { id: 'quasi-hyperbolic', presentBias: 0.1 };
    const created = await call(createDesign, team.editor, 'POST', '/designs', {}, { json: { ...defaultSpec('Strong present bias', priorId), model } });
    expect(created.status).toBe(201);
    const designId = String(created.body.design.id);
    const frozen = await call(freeze, team.editor, 'POST', `/designs/${designId}/freeze`, { designId });
    expect(frozen.status).toBe(201);
    const { name: _name, ...rates } = priorBody;
    const run = await call(startRun, team.editor, 'POST', '/power-runs', {}, {
      json: { designVersionId: frozen.body.version.id, truth: { model, prior: rates, gamma: 10, lapse: 0.02 }, calibration: 'simulated', test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' }, sampleSizes: [5], replications: 10, seed: 1 },
    });
    // before the fix: 422 "delayRange.max must be a finite number … (received NaN)"
    expect(run.status, JSON.stringify(run.body)).toBeLessThan(300);
  });

  it('lets exactly one of two saves from the same version win', async () => {
    const { team, call, priorId } = await setUp();
    const created = await call(createDesign, team.editor, 'POST', '/designs', {}, { json: defaultSpec('Race', priorId) });
    const designId = String(created.body.design.id);
    const save = (ratio: number) => call(putDesign, team.editor, 'PUT', `/designs/${designId}`, { designId }, { json: { spec: { ...defaultSpec('Race', priorId), ratio }, version: 1 } });
    const results = await Promise.all([save(0.4), save(0.7)]);
    expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
    const winner = results.find((r) => r.status === 200)!.body.design.spec.ratio;
    const now = await call(getDesign, team.viewer, 'GET', `/designs/${designId}`, { designId });
    expect(now.body.design).toMatchObject({ version: 2, spec: { ratio: winner } });
  });

  it('freezes into an immutable hashed version with its audit event, and editing starts a new draft', async () => {
    const { study, team, call, priorId } = await setUp();
    const created = await call(createDesign, team.editor, 'POST', '/designs', {}, { json: defaultSpec('To freeze', priorId) });
    const designId = String(created.body.design.id);
    expect((await call(freeze, team.viewer, 'POST', `/designs/${designId}/freeze`, { designId })).status).toBe(403);
    const first = await call(freeze, team.editor, 'POST', `/designs/${designId}/freeze`, { designId });
    expect(first.status).toBe(201);
    const v1 = first.body.version;
    expect(v1).toMatchObject({ number: 1, content: { spec: { name: 'To freeze' }, prior: { name: 'Canteen pilot', medianSmall: 0.02 } } });
    expect(v1.hash).toBe(contentHash(v1.content));
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'design.freeze' } })).toBe(1);
    const again = await call(freeze, team.editor, 'POST', `/designs/${designId}/freeze`, { designId });
    expect(again).toMatchObject({ status: 200, body: { created: false, version: { hash: v1.hash } } });
    expect((await call(getDesign, team.viewer, 'GET', `/designs/${designId}`, { designId })).body.design).toMatchObject({ frozen: true, latestVersion: { number: 1 } });

    await call(putDesign, team.editor, 'PUT', `/designs/${designId}`, { designId }, { json: { spec: { ...defaultSpec('To freeze', priorId), probePairs: 6 }, version: 1 } });
    expect((await call(getDesign, team.viewer, 'GET', `/designs/${designId}`, { designId })).body.design).toMatchObject({ frozen: false, latestVersion: { number: 1 } });
    const v2 = await freezeDesign(team.editor.id, study.id, Number(designId));
    expect(v2.number).toBe(2);
    expect(v2.hash).not.toBe(v1.hash);
    const stored = await DesignVersion.findByPk(v1.id);
    expect(stored!.content.spec.probePairs).toBe(4); // the first version is untouched

    const byHash = await call(getVersion, team.viewer, 'GET', `/design-versions/${v1.hash}`, { versionId: v1.hash });
    expect(byHash.body.version).toMatchObject({ id: v1.id, hash: v1.hash });
    const versions = await call(listVersions, team.viewer, 'GET', '/design-versions');
    expect(versions.body.versions.map((v: { number: number }) => v.number)).toEqual([2, 1]);
    expect((await call(deleteDesign, team.editor, 'DELETE', `/designs/${designId}`, { designId })).status).toBe(409);
  });

  it('takes comments from any member, viewers included, with author and time', async () => {
    const { team, outsider, call, priorId } = await setUp();
    const created = await call(createDesign, team.editor, 'POST', '/designs', {}, { json: defaultSpec('Discussed', priorId) });
    const designId = String(created.body.design.id);
    const posted = await call(postComment, team.viewer, 'POST', `/designs/${designId}/comments`, { designId }, { json: { text: 'Is 730 days too long?' } });
    expect(posted.status).toBe(201);
    expect((await call(postComment, outsider, 'POST', `/designs/${designId}/comments`, { designId }, { json: { text: 'hello' } })).status).toBe(404);
    expect((await call(postComment, team.viewer, 'POST', `/designs/${designId}/comments`, { designId }, { json: { text: '   ' } })).status).toBe(422);
    const listed = await call(listComments, team.owner, 'GET', `/designs/${designId}/comments`, { designId });
    expect(listed.body.comments).toEqual([expect.objectContaining({ text: 'Is 730 days too long?', author: { id: team.viewer.id, name: team.viewer.name }, createdAt: expect.any(String) })]);
  });

  it('keeps a prior set that designs use, and deletes unfrozen drafts', async () => {
    const { team, call, priorId } = await setUp();
    const created = await call(createDesign, team.editor, 'POST', '/designs', {}, { json: defaultSpec('Draft', priorId) });
    const designId = String(created.body.design.id);
    expect((await call(deletePrior, team.editor, 'DELETE', `/priors/${priorId}`, { priorId: String(priorId) })).status).toBe(409);
    expect((await call(deleteDesign, team.editor, 'DELETE', `/designs/${designId}`, { designId })).status).toBe(204);
    expect((await call(listDesigns, team.viewer, 'GET', '/designs')).body.designs).toEqual([]);
    expect((await call(deletePrior, team.editor, 'DELETE', `/priors/${priorId}`, { priorId: String(priorId) })).status).toBe(204);
  });
});
