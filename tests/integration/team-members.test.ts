// Member management on the real MariaDB: only owners change roles or remove others, anyone may
// leave, and a study always keeps at least one owner, also when two owners act at the same moment.
import { beforeAll, describe, expect, it } from 'vitest';
import { DELETE as removeRoute, PATCH as patchRoute } from '@/app/api/studies/[id]/members/[userId]/route';
import { AuditEvent, Membership } from '@/db/models';
import { ctx, makeStudyWithTeam, makeUser, migrateUp, requestAs, type TestUser } from '../support/integration';

beforeAll(migrateUp);

async function setRole(actor: TestUser, studyId: number, userId: number, role: unknown) {
  const params = { id: String(studyId), userId: String(userId) };
  const response = await patchRoute(await requestAs(actor, 'PATCH', `/api/studies/${studyId}/members/${userId}`, { json: { role } }), ctx(params));
  return { status: response.status, body: await response.json() };
}

async function remove(actor: TestUser, studyId: number, userId: number) {
  const params = { id: String(studyId), userId: String(userId) };
  const response = await removeRoute(await requestAs(actor, 'DELETE', `/api/studies/${studyId}/members/${userId}`), ctx(params));
  return response.status;
}

const roleOf = async (studyId: number, userId: number) => (await Membership.findOne({ where: { studyId, userId } }))?.role ?? null;

describe('changing roles', () => {
  it('lets an owner change a role and records who changed what', async () => {
    const { study, team } = await makeStudyWithTeam('Role change');
    const reply = await setRole(team.owner, study.id, team.viewer.id, 'editor');
    expect(reply).toEqual({ status: 200, body: { userId: team.viewer.id, role: 'editor', changed: true } });
    expect(await roleOf(study.id, team.viewer.id)).toBe('editor');
    const event = await AuditEvent.findOne({ where: { studyId: study.id, action: 'member.role-change' } });
    expect(event).toMatchObject({ actorId: team.owner.id, details: { userId: team.viewer.id, email: team.viewer.email, from: 'viewer', to: 'editor' } });
  });

  it('refuses every role below owner', async () => {
    const { study, team } = await makeStudyWithTeam('Role change refused');
    for (const role of ['editor', 'operator', 'viewer'] as const) {
      expect((await setRole(team[role], study.id, team.viewer.id, 'owner')).status).toBe(403);
    }
    expect(await roleOf(study.id, team.viewer.id)).toBe('viewer');
  });

  it('names an unknown role, and answers 404 for a non-member', async () => {
    const { study, team, outsider } = await makeStudyWithTeam('Role change input');
    const bad = await setRole(team.owner, study.id, team.viewer.id, 'boss');
    expect(bad.status).toBe(422);
    expect(bad.body.issues[0].path).toBe('role');
    expect((await setRole(team.owner, study.id, outsider.id, 'viewer')).status).toBe(404);
  });
});

describe('the last owner', () => {
  it('can be neither demoted nor removed, nor leave', async () => {
    const { study, team } = await makeStudyWithTeam('Last owner');
    const before = await AuditEvent.count({ where: { studyId: study.id } });
    const demote = await setRole(team.owner, study.id, team.owner.id, 'editor');
    expect(demote.status).toBe(409);
    expect(demote.body.error).toMatch(/at least one owner/);
    expect(await remove(team.owner, study.id, team.owner.id)).toBe(409);
    expect(await roleOf(study.id, team.owner.id)).toBe('owner');
    // A refused change leaves no audit event behind.
    expect(await AuditEvent.count({ where: { studyId: study.id } })).toBe(before);
  });

  it('can step down once a second owner exists', async () => {
    const { study, team } = await makeStudyWithTeam('Second owner');
    expect((await setRole(team.owner, study.id, team.editor.id, 'owner')).status).toBe(200);
    expect((await setRole(team.owner, study.id, team.owner.id, 'viewer')).status).toBe(200);
    expect(await roleOf(study.id, team.editor.id)).toBe('owner');
  });

  it('survives two owners demoting each other at the same moment', async () => {
    for (let round = 0; round < 3; round++) {
      const { study, team } = await makeStudyWithTeam(`Racing owners ${round}`);
      const second = await makeUser('second-owner');
      await Membership.create({ studyId: study.id, userId: second.id, role: 'owner' });
      const [a, b] = await Promise.all([setRole(team.owner, study.id, second.id, 'editor'), setRole(second, study.id, team.owner.id, 'editor')]);
      expect([a.status, b.status].sort()).toEqual([200, 409]);
      expect(await Membership.count({ where: { studyId: study.id, role: 'owner' } })).toBe(1);
    }
  });

  it('survives two owners leaving at the same moment', async () => {
    const { study, team } = await makeStudyWithTeam('Racing leavers');
    const second = await makeUser('second-leaver');
    await Membership.create({ studyId: study.id, userId: second.id, role: 'owner' });
    const statuses = await Promise.all([remove(team.owner, study.id, team.owner.id), remove(second, study.id, second.id)]);
    expect(statuses.sort()).toEqual([204, 409]);
    expect(await Membership.count({ where: { studyId: study.id, role: 'owner' } })).toBe(1);
  });
});

describe('removing members and leaving', () => {
  it('lets an owner remove a member, audited', async () => {
    const { study, team } = await makeStudyWithTeam('Removal');
    expect(await remove(team.owner, study.id, team.operator.id)).toBe(204);
    expect(await roleOf(study.id, team.operator.id)).toBeNull();
    expect(await AuditEvent.findOne({ where: { studyId: study.id, action: 'member.remove' } })).toMatchObject({
      actorId: team.owner.id,
      details: { userId: team.operator.id, role: 'operator' },
    });
  });

  it('refuses non-owners removing someone else, but lets anyone leave', async () => {
    const { study, team } = await makeStudyWithTeam('Leaving');
    expect(await remove(team.editor, study.id, team.viewer.id)).toBe(403);
    expect(await remove(team.viewer, study.id, team.operator.id)).toBe(403);
    expect(await roleOf(study.id, team.viewer.id)).toBe('viewer');
    expect(await remove(team.viewer, study.id, team.viewer.id)).toBe(204);
    expect(await roleOf(study.id, team.viewer.id)).toBeNull();
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'member.leave', actorId: team.viewer.id } })).toBe(1);
    // Once out, the study is invisible to them.
    expect(await remove(team.viewer, study.id, team.viewer.id)).toBe(404);
  });
});
