// The sessions list of a study: counts per status, the filter, the CSV export (formula-safe) and the
// idle time after which an unfinished session reads as abandoned.
import { beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, ParticipantSession } from '@/db/models';
import { GET as listSessions, PATCH as setIdle } from '@/app/api/studies/[id]/sessions/route';
import { GET as starter } from '@/app/api/studies/[id]/item-bank/[versionId]/starter/route';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { serveProbeItems } from '@/lib/server/services/participants';
import { BASE, ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';

describe('the sessions of a study', () => {
  beforeAll(migrateUp);

  it('counts, filters and exports sessions, and reads abandoned after the idle time an operator sets', async () => {
    const { study, team } = await makeStudyWithTeam('Sessions route study');
    const version = await makeFrozenVersion(study.id);
    const responses = answersOf(bankFor(version).bank.items, { kSmall: 0.05, kLarge: 0.01 });
    await serveProbeItems(version, 'R-served', responses, { source: 'batch', userId: team.operator.id });
    const twoHoursAgo = new Date(Date.now() - 2 * 3600_000);
    await ParticipantSession.create({ studyId: study.id, designVersionId: version.id, participantId: '=cmd|calc', status: 'started', source: 'api', apiKeyId: null, calibrationAnswers: null, startedAt: twoHoursAgo, calibratedAt: null, servedAt: null, completedAt: null, lastActivityAt: twoHoursAgo });
    const get = async (query = '') => listSessions(await requestAs(team.viewer, 'GET', `/api/studies/${study.id}/sessions${query}`), ctx({ id: String(study.id) }));

    const all = (await (await get()).json()) as { idleMinutes: number; counts: Record<string, number>; sessions: Array<{ participantId: string; status: string }> };
    expect(all.idleMinutes).toBe(60);
    expect(all.counts).toMatchObject({ served: 1, abandoned: 1, started: 0 });
    const abandoned = (await (await get('?status=abandoned')).json()) as { sessions: Array<{ participantId: string }> };
    expect(abandoned.sessions.map((s) => s.participantId)).toEqual(['=cmd|calc']);
    expect((await get('?status=lost')).status).toBe(422);

    const csv = await (await get('?format=csv')).text();
    expect(csv.split('\r\n')[0]).toBe('participantId,status,answered,itemCount,source,designVersionId,startedAt,servedAt,completedAt,lastActivityAt,caution');
    expect(csv).toContain("'=cmd|calc,abandoned");

    const patch = async (user: typeof team.viewer, json: unknown) => setIdle(await requestAs(user, 'PATCH', `/api/studies/${study.id}/sessions`, { json }), ctx({ id: String(study.id) }));
    expect((await patch(team.viewer, { idleMinutes: 240 })).status).toBe(403);
    expect((await patch(team.operator, { idleMinutes: 2 })).status).toBe(422);
    expect((await patch(team.operator, { idleMinutes: 240 })).status).toBe(200);
    const later = (await (await get()).json()) as { counts: Record<string, number> };
    expect(later.counts).toMatchObject({ started: 1, abandoned: 0 });
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'sessions.idle-time' } })).toBe(1);
  });

  it('lets operators download the starter experiment of a frozen version', async () => {
    const { study, team } = await makeStudyWithTeam('Starter route study');
    const version = await makeFrozenVersion(study.id);
    const reply = await starter(await requestAs(team.operator, 'GET', `/api/studies/${study.id}/item-bank/${version.id}/starter`, { headers: { host: '127.0.0.1:3100' } }), ctx({ id: String(study.id), versionId: String(version.id) }));
    expect(reply.status).toBe(200);
    expect(reply.headers.get('content-disposition')).toMatch(/switchback-starter-\d+-v1-[0-9a-f]{12}\.html/);
    const html = await reply.text();
    expect(html).toContain(`"studyId": ${study.id}`);
    expect(html).toContain(`"apiBase": "${new URL(BASE).origin}"`);
  });
});
