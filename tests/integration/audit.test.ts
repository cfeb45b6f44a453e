// The audit trail on the real MariaDB: events are written in the same transaction as the change
// (a failing change leaves no event; a failing event undoes the change), listed for owners and
// editors, and exported as CSV that a spreadsheet cannot execute.
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { GET as listRoute } from '@/app/api/studies/[id]/audit/route';
import { GET as csvRoute } from '@/app/api/studies/[id]/audit/csv/route';
import { PATCH as patchMemberRoute } from '@/app/api/studies/[id]/members/[userId]/route';
import { POST as inviteRoute } from '@/app/api/studies/[id]/invitations/route';
import { AuditEvent, Invitation, Membership, PriorSet, User } from '@/db/models';
import { recordAudit } from '@/lib/server/services/audit';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';

// Lets a test make the audit write itself fail, to prove the change it describes is rolled back.
const failAudit = vi.hoisted(() => ({ on: false }));
vi.mock('@/lib/server/services/audit', async (importOriginal) => {
  const original = await importOriginal<typeof import('@/lib/server/services/audit')>();
  return {
    recordAudit: (...args: Parameters<typeof original.recordAudit>) =>
      failAudit.on ? original.recordAudit({ ...args[0], action: 'x'.repeat(200) }, args[1]) : original.recordAudit(...args),
  };
});

beforeAll(migrateUp);

describe('audit events are atomic with their change', () => {
  it('a refused change leaves no event', async () => {
    const { study, team } = await makeStudyWithTeam('Atomic refusal');
    const before = await AuditEvent.count({ where: { studyId: study.id } });
    const params = { id: String(study.id), userId: String(team.owner.id) };
    const reply = await patchMemberRoute(await requestAs(team.owner, 'PATCH', '/x', { json: { role: 'viewer' } }), ctx(params));
    expect(reply.status).toBe(409);
    expect(await AuditEvent.count({ where: { studyId: study.id } })).toBe(before);
  });

  it('a change whose audit event cannot be written is undone', async () => {
    const { study, team } = await makeStudyWithTeam('Atomic failure');
    const params = { id: String(study.id), userId: String(team.viewer.id) };
    failAudit.on = true;
    const quiet = vi.spyOn(console, 'error').mockImplementation(() => {}); // the expected 500s log a reference
    try {
      const roleChange = await patchMemberRoute(await requestAs(team.owner, 'PATCH', '/x', { json: { role: 'editor' } }), ctx(params));
      expect(roleChange.status).toBe(500);
      const invitation = await inviteRoute(await requestAs(team.owner, 'POST', '/x', { json: { email: 'atomic@invitees.example.org', role: 'viewer' } }), ctx({ id: String(study.id) }));
      expect(invitation.status).toBe(500);
    } finally {
      failAudit.on = false;
      quiet.mockRestore();
    }
    expect((await Membership.findOne({ where: { studyId: study.id, userId: team.viewer.id } }))!.role).toBe('viewer');
    expect(await Invitation.count({ where: { studyId: study.id } })).toBe(0);
  });
});

describe('the audit list and its CSV', () => {
  it('lists events newest first with the actor, for editors and owners only', async () => {
    const { study, team } = await makeStudyWithTeam('Audit list');
    await recordAudit({ actorId: team.editor.id, studyId: study.id, action: 'design.freeze', details: { hash: 'abc' } });
    await recordAudit({ actorId: team.owner.id, studyId: study.id, action: 'apikey.create', details: { label: 'lab tablet' } });
    const reply = await listRoute(await requestAs(team.editor, 'GET', '/x'), ctx({ id: String(study.id) }));
    expect(reply.status).toBe(200);
    const { events } = await reply.json();
    expect(events.map((e: { action: string }) => e.action)).toEqual(['apikey.create', 'design.freeze']);
    expect(events[1]).toMatchObject({ actorName: team.editor.name, actorEmail: team.editor.email, details: { hash: 'abc' } });
    for (const role of ['operator', 'viewer'] as const) {
      expect((await listRoute(await requestAs(team[role], 'GET', '/x'), ctx({ id: String(study.id) }))).status).toBe(403);
    }
  });

  it('names the designs, frozen versions, prior sets and people its events point to by id, so the page can write sentences', async () => {
    const { study, team } = await makeStudyWithTeam('Audit names');
    const prior = await PriorSet.create({ studyId: study.id, name: 'Harbourlight pilot prior', values: { medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 0 }, source: 'manual', notes: '', createdBy: team.editor.id });
    await recordAudit({ actorId: team.owner.id, studyId: study.id, action: 'member.role-change', details: { userId: team.viewer.id, email: team.viewer.email, from: 'viewer', to: 'operator' } });
    await recordAudit({ actorId: team.editor.id, studyId: study.id, action: 'prior.create', details: { priorId: prior.id, name: prior.name } });
    const reply = await listRoute(await requestAs(team.editor, 'GET', '/x'), ctx({ id: String(study.id) }));
    const { names } = await reply.json();
    expect(names.priors).toEqual({ [String(prior.id)]: 'Harbourlight pilot prior' });
    expect(names.users[String(team.viewer.id)]).toBe(team.viewer.name);
    expect(names.users[String(team.owner.id)]).toBe(team.owner.name);
    expect(names.designs).toEqual({});
  });

  it('exports CSV with formula-like cells neutralised, and records the export', async () => {
    const { study, team } = await makeStudyWithTeam('Audit CSV');
    await User.update({ name: '=HYPERLINK("http://evil.example","x")' }, { where: { id: team.editor.id } });
    await recordAudit({ actorId: team.editor.id, studyId: study.id, action: 'export.item-bank', details: { note: 'a, "quoted" value' } });
    const reply = await csvRoute(await requestAs(team.owner, 'GET', '/x'), ctx({ id: String(study.id) }));
    expect(reply.status).toBe(200);
    expect(reply.headers.get('content-type')).toMatch(/text\/csv/);
    expect(reply.headers.get('content-disposition')).toContain(`study-${study.id}-audit-trail.csv`);
    const csv = await reply.text();
    const lines = csv.trimEnd().split('\r\n');
    expect(lines[0]).toBe('time_utc,action,actor_name,actor_email,details');
    expect(lines[1]).toContain(`"'=HYPERLINK(""http://evil.example"",""x"")"`);
    expect(lines[1]).toContain('"note=a, ""quoted"" value"');
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'audit.export', actorId: team.owner.id } })).toBe(1);
  });
});
