// The participants list of a study: search by part of an id, filters by session status (with counts)
// and frozen version, pages with a total, bad query parameters refused naming the field, and the
// CSV export of exactly what is filtered (every page), the caution in its last column.
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { ParticipantSession } from '@/db/models';
import { GET as listParticipants } from '@/app/api/studies/[id]/participants/route';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { PERSON_CAUTION } from '@/lib/shared/cautions';
import { serveProbeItems } from '@/lib/server/services/participants';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';

type Page = { total: number; page: number; pageSize: number; pageCount: number; counts: Record<string, number>; caution: string; participants: Array<{ participantId: string; status: string; designVersionId: number; served: { kSmall: { rate: number } } | null }> };

describe('the participants list', () => {
  let studyId: number;
  let viewer: TestUser;
  let versionA: number;
  let versionB: number;
  const get = async (query = '') => listParticipants(await requestAs(viewer, 'GET', `/api/studies/${studyId}/participants${query}`), ctx({ id: String(studyId) }));
  const page = async (query = '') => {
    const reply = await get(query);
    expect(reply.status).toBe(200);
    return (await reply.json()) as Page;
  };

  beforeAll(async () => {
    await migrateUp();
    const { study, team } = await makeStudyWithTeam('Participant list study');
    studyId = study.id;
    viewer = team.viewer;
    const a = await makeFrozenVersion(study.id);
    const b = await makeFrozenVersion(study.id);
    versionA = a.id;
    versionB = b.id;
    // 12 served on version A (HL-001 … HL-012), 3 on version B (Q-%1, Q_x, q-low), 2 sessions that never reached serving
    const responses = answersOf(bankFor(a).bank.items, { kSmall: 0.05, kLarge: 0.01 });
    for (let i = 1; i <= 12; i += 1) await serveProbeItems(a, `HL-${String(i).padStart(3, '0')}`, responses, { source: 'batch', userId: team.operator.id });
    for (const id of ['Q-%1', 'Q_x', 'q-low']) await serveProbeItems(b, id, answersOf(bankFor(b).bank.items, { kSmall: 0.05, kLarge: 0.01 }), { source: 'batch', userId: team.operator.id });
    const now = new Date(Date.now() + 60_000); // a minute ahead: newest activity even where whole-second times tie
    const hoursAgo = new Date(Date.now() - 3 * 3600_000);
    await ParticipantSession.create({ studyId, designVersionId: versionA, participantId: 'HL-started', status: 'started', source: 'api', apiKeyId: null, calibrationAnswers: null, startedAt: now, calibratedAt: null, servedAt: null, completedAt: null, lastActivityAt: now });
    await ParticipantSession.create({ studyId, designVersionId: versionA, participantId: 'HL-gone', status: 'calibrated', source: 'api', apiKeyId: null, calibrationAnswers: null, startedAt: hoursAgo, calibratedAt: hoursAgo, servedAt: null, completedAt: null, lastActivityAt: hoursAgo });
  });

  it('pages through everyone with a total and counts per status, most recent activity first', async () => {
    const first = await page('?pageSize=10');
    expect(first).toMatchObject({ total: 17, page: 1, pageSize: 10, pageCount: 2, caution: PERSON_CAUTION });
    expect(first.counts).toEqual({ started: 1, calibrated: 0, served: 15, completed: 0, abandoned: 1 });
    expect(first.participants).toHaveLength(10);
    expect(first.participants[0].participantId).toBe('HL-started');
    const second = await page('?pageSize=10&page=2');
    expect(second.participants).toHaveLength(7);
    const ids = [...first.participants, ...second.participants].map((p) => p.participantId);
    expect(new Set(ids).size).toBe(17);
    // a page past the last reads as the last (a stale link still shows people)
    expect((await page('?pageSize=10&page=9')).page).toBe(2);
    // the default size is 25
    expect((await page()).participants).toHaveLength(17);
  });

  it('searches part of an id in any letter case, taking % and _ literally', async () => {
    expect((await page('?q=hl-01')).participants.map((p) => p.participantId).sort()).toEqual(['HL-010', 'HL-011', 'HL-012']);
    expect((await page('?q=Q-')).participants.map((p) => p.participantId).sort()).toEqual(['Q-%1', 'q-low']);
    expect((await page(`?q=${encodeURIComponent('%')}`)).participants.map((p) => p.participantId)).toEqual(['Q-%1']);
    expect((await page('?q=_')).participants.map((p) => p.participantId)).toEqual(['Q_x']);
    const searched = await page('?q=hl');
    expect(searched.total).toBe(14);
    expect(searched.counts).toEqual({ started: 1, calibrated: 0, served: 12, completed: 0, abandoned: 1 });
  });

  it('filters by session status and by frozen version, the counts following the version', async () => {
    const abandoned = await page('?status=abandoned');
    expect(abandoned.participants.map((p) => [p.participantId, p.status, p.served])).toEqual([['HL-gone', 'abandoned', null]]);
    const served = await page('?status=served&pageSize=50');
    expect(served.total).toBe(15);
    expect(served.participants.every((p) => p.served !== null && p.served.kSmall.rate > 0)).toBe(true);
    const onB = await page(`?version=${versionB}`);
    expect(onB.participants.map((p) => p.designVersionId)).toEqual([versionB, versionB, versionB]);
    expect(onB.counts).toEqual({ started: 0, calibrated: 0, served: 3, completed: 0, abandoned: 0 });
    expect((await page(`?version=${versionA}&status=started&q=started`)).participants.map((p) => p.participantId)).toEqual(['HL-started']);
  });

  it.each([
    ['?page=0', 'page'],
    ['?page=two', 'page'],
    ['?pageSize=7', 'pageSize'],
    ['?pageSize=1e9', 'pageSize'],
    ['?status=lost', 'status'],
    ['?version=-3', 'version'],
    ['?version=abc', 'version'],
    [`?q=${'x'.repeat(129)}`, 'q'],
    ['?format=xml', 'format'],
    ['?sort=name', '(query)'],
  ])('bad input: %s is refused with 422 naming %s', async (query, field) => {
    const reply = await get(query);
    expect(reply.status).toBe(422);
    const body = (await reply.json()) as { issues: Array<{ path: string; message: string }> };
    expect(body.issues[0].path).toBe(field);
    if (field === '(query)') expect(body.issues[0].message).toContain('sort');
  });

  it('exports every participant the filters select, on all pages, as plain CSV with the caution in the last column', async () => {
    const reply = await get('?q=HL&pageSize=10&page=2&format=csv');
    expect(reply.headers.get('content-type')).toContain('text/csv');
    const text = await reply.text();
    expect(text.startsWith('participantId,status,')).toBe(true);
    const parsed = Papa.parse<Record<string, string>>(text.trim(), { header: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields?.at(-1)).toBe('caution');
    expect(new Set(parsed.data.map((r) => r.participantId)).size).toBe(14);
    expect(parsed.data.every((r) => r.caution === PERSON_CAUTION)).toBe(true);
    // the served have one row per item, the unserved one row with their status
    expect(parsed.data.filter((r) => r.participantId === 'HL-gone')).toEqual([expect.objectContaining({ status: 'abandoned', kSmall: '' })]);
    expect(parsed.data.filter((r) => r.participantId === 'HL-001').length).toBeGreaterThan(1);
    const empty = await (await get('?q=nobody&format=csv')).text();
    expect(empty.split('\r\n')[0].split(',').at(-1)).toBe('caution');
  });
});
