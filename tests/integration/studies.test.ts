import { beforeAll, describe, expect, it } from 'vitest';
import { GET as listStudies, POST as createStudy } from '@/app/api/studies/route';
import { GET as getStudy, PATCH as patchStudy, DELETE as deleteStudy } from '@/app/api/studies/[id]/route';
import { GET as listMembers } from '@/app/api/studies/[id]/members/route';
import { AuditEvent, Study } from '@/db/models';
import { ctx, makeStudyWithTeam, makeUser, migrateUp, requestAs } from '../support/integration';

beforeAll(migrateUp);

describe('creating and listing studies', () => {
  it('makes the creator the owner and lists the study with that role', async () => {
    const user = await makeUser('creator');
    const created = await createStudy(await requestAs(user, 'POST', '/api/studies', { json: { name: 'Commute bonus timing', description: 'Pilot' } }), ctx({}));
    expect(created.status).toBe(201);
    const { study, role } = await created.json();
    expect(role).toBe('owner');
    const listed = await (await listStudies(await requestAs(user, 'GET', '/api/studies'), ctx({}))).json();
    expect(listed.studies).toEqual([expect.objectContaining({ id: study.id, name: 'Commute bonus timing', role: 'owner' })]);
    const members = await (await listMembers(await requestAs(user, 'GET', `/api/studies/${study.id}/members`), ctx({ id: String(study.id) }))).json();
    expect(members.members).toEqual([expect.objectContaining({ userId: user.id, role: 'owner' })]);
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'study.create' } })).toBe(1);
  });
});

describe('bad input gets a 4xx JSON answer naming the problem, never a 500', () => {
  it('answers malformed JSON with 400', async () => {
    const user = await makeUser('bad-json');
    const response = await createStudy(await requestAs(user, 'POST', '/api/studies', { body: '{"name": "oops"', headers: { 'content-type': 'application/json' } }), ctx({}));
    expect(response.status).toBe(400);
    expect((await response.json()).error).toMatch(/not valid JSON/);
  });

  it('answers a body over 1 MB with 413', async () => {
    const user = await makeUser('big-body');
    const huge = JSON.stringify({ name: 'x'.repeat(1_100_000) });
    const response = await createStudy(await requestAs(user, 'POST', '/api/studies', { body: huge, headers: { 'content-type': 'application/json' } }), ctx({}));
    expect(response.status).toBe(413);
  });

  it('answers wrong types and unknown fields with 422 and the field names', async () => {
    const user = await makeUser('wrong-types');
    const response = await createStudy(await requestAs(user, 'POST', '/api/studies', { json: { name: 42, colour: 'teal' } }), ctx({}));
    expect(response.status).toBe(422);
    const body = await response.json();
    const paths = body.issues.map((i: { path: string; message: string }) => `${i.path} ${i.message}`).join(' | ');
    expect(paths).toMatch(/name/);
    expect(paths).toMatch(/colour/);
  });

  it('requires the version on a rename', async () => {
    const { study, team } = await makeStudyWithTeam();
    const response = await patchStudy(await requestAs(team.owner, 'PATCH', `/api/studies/${study.id}`, { json: { name: 'No version' } }), ctx({ id: String(study.id) }));
    expect(response.status).toBe(422);
    expect(JSON.stringify(await response.json())).toMatch(/version/);
  });
});

describe('optimistic locking', () => {
  it('lets exactly one of two concurrent renames with the same version win, and keeps its name', async () => {
    const { study, team } = await makeStudyWithTeam('Before');
    const id = String(study.id);
    const rename = async (name: string) =>
      patchStudy(await requestAs(team.owner, 'PATCH', `/api/studies/${id}`, { json: { name, version: study.version } }), ctx({ id }));
    const [a, b] = await Promise.all([rename('Renamed by A'), rename('Renamed by B')]);
    const statuses = [a.status, b.status].sort();
    expect(statuses).toEqual([200, 409]);
    const winner = a.status === 200 ? 'Renamed by A' : 'Renamed by B';
    const stored = await Study.findByPk(study.id);
    expect(stored?.name).toBe(winner);
    expect(stored?.version).toBe(study.version + 1);
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'study.update' } })).toBe(1);
  });

  it('refuses a save based on a stale version after a successful one', async () => {
    const { study, team } = await makeStudyWithTeam('Stale');
    const id = String(study.id);
    const first = await patchStudy(await requestAs(team.owner, 'PATCH', `/api/studies/${id}`, { json: { name: 'First', version: 1 } }), ctx({ id }));
    expect(first.status).toBe(200);
    const stale = await patchStudy(await requestAs(team.owner, 'PATCH', `/api/studies/${id}`, { json: { description: 'Late', version: 1 } }), ctx({ id }));
    expect(stale.status).toBe(409);
    expect((await Study.findByPk(study.id))?.description).toBe('');
  });
});

describe('deleting a study', () => {
  it('removes it for everyone and leaves an audit event', async () => {
    const { study, team } = await makeStudyWithTeam('To delete');
    const id = String(study.id);
    expect((await deleteStudy(await requestAs(team.owner, 'DELETE', `/api/studies/${id}`), ctx({ id }))).status).toBe(204);
    expect((await getStudy(await requestAs(team.viewer, 'GET', `/api/studies/${id}`), ctx({ id }))).status).toBe(404);
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'study.delete' } })).toBe(1);
  });
});
