// Switchback's own session page on the real MariaDB, through its route handlers: a participant's
// whole run (consent, instructions, calibration, stage 2 with no break, completion code and
// redirect), what lands in which table, every error status of the new routes, idempotent answers
// (50 parallel submissions, one record), the session cookie, and a preview that stores nothing.
import { beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Participant, ParticipantSession, SessionLink, Stage2Answer } from '@/db/models';
import { loadStudyData } from '@/lib/server/services/observed-choices';
import { GET as pageGet, POST as pagePost } from '@/app/api/session-page/[slug]/route';
import { GET as linksGet, POST as linksPost } from '@/app/api/studies/[id]/session-links/route';
import { PATCH as linkPatch } from '@/app/api/studies/[id]/session-links/[linkId]/route';
import { POST as previewPost } from '@/app/api/studies/[id]/session-links/[linkId]/preview/route';
import { pageRateLimiter } from '@/lib/server/http/session-page-route';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { serveParticipant } from '@/lib/design';
import { listSessionStatuses } from '@/lib/server/services/session-status';
import type { PageState } from '@/lib/shared/session-page';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';
import { makeFrozenVersion } from './item-bank-support';

type Reply = { status: number; body: PageState & { error?: string; issues?: Array<{ path: string }>; state?: PageState }; cookie: string | null; setCookie: string | null };

async function reply(response: Response): Promise<Reply> {
  const setCookie = response.headers.get('set-cookie');
  return { status: response.status, body: await response.json(), setCookie, cookie: setCookie ? setCookie.split(';')[0]! : null };
}

function participantApi(slug: string) {
  return {
    get: async (participantId: string | null, cookie: string | null = null) =>
      reply(await pageGet(await requestAs(null, 'GET', `/api/session-page/${slug}${participantId === null ? '' : `?participantId=${encodeURIComponent(participantId)}`}`, { headers: cookie ? { cookie } : {} }), ctx({ slug }))),
    post: async (body: unknown, cookie: string | null = null, headers: Record<string, string> = {}) =>
      reply(await pagePost(await requestAs(null, 'POST', `/api/session-page/${slug}`, { body: JSON.stringify(body), headers: { ...(cookie ? { cookie } : {}), ...headers } }), ctx({ slug }))),
  };
}

async function setUp(name: string) {
  const { study, team } = await makeStudyWithTeam(name);
  const version = await makeFrozenVersion(study.id);
  const { bank, locate } = bankFor(version);
  const byId = new Map(bank.items.map((i) => [i.id, i]));
  return { study, team, version, bank, locate, byId };
}

type Setup = Awaited<ReturnType<typeof setUp>>;

async function createLink(s: Setup, user: TestUser, overrides: Record<string, unknown> = {}) {
  const response = await linksPost(
    await requestAs(user, 'POST', `/api/studies/${s.study.id}/session-links`, {
      json: { designVersionId: s.version.id, name: 'Wave 1', title: 'Choices about money and time', consentText: 'You agree to take part.', instructions: 'Choose the option you prefer.', completionCode: 'HARBOUR-42', redirectUrl: 'https://panel.example.org/done?study=7', ...overrides },
    }),
    ctx({ id: String(s.study.id) }),
  );
  expect(response.status).toBe(201);
  const { link } = (await response.json()) as { link: { id: number; path: string } };
  return { ...link, slug: link.path.replace('/s/', '') };
}

/** A consistent chooser: a hyperbolic discounter (k = 0.05 small, 0.01 large per day) who passes the attention checks. */
function choose(s: Setup, itemId: string): 'sooner' | 'later' {
  const item = s.byId.get(itemId);
  if (itemId.startsWith('check-') || !item) return itemId.startsWith('check-') ? 'sooner' : 'later';
  const k = item.magnitude === 'small' ? 0.05 : 0.01;
  return item.laterAmount / (1 + k * (item.laterDelay - item.soonerDelay)) > item.soonerAmount ? 'later' : 'sooner';
}

const answer = (state: PageState, chosen: 'sooner' | 'later') => {
  if (state.step.kind !== 'choice') throw new Error(`expected a choice, got ${state.step.kind}`);
  return { action: 'answer', participantId: state.participantId, itemId: state.step.choice.itemId, chosen, responseTimeMs: 900, sideShown: state.step.choice.options.find((o) => o.option === 'sooner')!.side };
};

async function startedSession(api: ReturnType<typeof participantApi>, participantId: string) {
  const consent = await api.post({ action: 'consent', participantId, agree: true });
  expect(consent.status).toBe(200);
  const begun = await api.post({ action: 'begin', participantId }, consent.cookie);
  expect(begun.status).toBe(200);
  return { cookie: consent.cookie!, state: begun.body };
}

describe('the session page', () => {
  let s: Setup;
  beforeAll(async () => {
    await migrateUp();
    s = await setUp('Session page study');
    pageRateLimiter.reset();
  });

  it('runs a participant from consent through both blocks to the completion code and redirect, writing the API tables', async () => {
    const link = await createLink(s, s.team.operator);
    const api = participantApi(link.slug);
    const first = await api.get('PN-001');
    expect(first.status).toBe(200);
    expect(first.body.step).toEqual({ kind: 'consent' });
    expect(first.body.link).toMatchObject({ title: 'Choices about money and time', consentText: 'You agree to take part.', participantParam: 'pid' });
    expect(await ParticipantSession.count({ where: { studyId: s.study.id } }), 'opening the link records nothing').toBe(0);

    const consent = await api.post({ action: 'consent', participantId: 'PN-001', agree: true });
    expect(consent.status).toBe(200);
    expect(consent.body.step).toEqual({ kind: 'instructions' });
    expect(consent.setCookie).toMatch(/^sb_session=[\w-]{20,};/);
    expect(consent.setCookie).toMatch(/HttpOnly/i);
    expect(consent.setCookie).toMatch(/SameSite=Strict/i);
    expect(consent.setCookie).toContain(`Path=/api/session-page/${link.slug}`);
    const token = consent.cookie!.split('=')[1]!;
    const row = await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'PN-001' } });
    expect(row).toMatchObject({ status: 'started', source: 'page', sessionLinkId: link.id });
    expect(row!.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(row!.tokenHash).not.toContain(token);

    let state = (await api.post({ action: 'begin', participantId: 'PN-001' }, consent.cookie)).body;
    const calibration = s.bank.items.filter((i) => i.block === 'calibration');
    const seen: string[] = [];
    while (state.step.kind === 'choice' && state.step.choice.block === 'calibration') {
      seen.push(state.step.choice.itemId);
      expect(state.step.number).toBe(seen.length);
      const next = await api.post(answer(state, choose(s, state.step.choice.itemId)), consent.cookie);
      expect(next.status).toBe(200);
      state = next.body;
      if (seen.length === 3) {
        // a reload: the page asks again with its cookie and gets the same, fourth, item
        const reloaded = await api.get('PN-001', consent.cookie);
        expect(reloaded.body.step).toEqual(state.step);
      }
    }
    expect(seen).toEqual(calibration.sort((a, b) => a.position - b.position).map((i) => i.id));
    // no break: the reply to the last calibration answer is the first stage-2 item, served as the API serves
    expect(state.step.kind).toBe('choice');
    const served = await Participant.findOne({ where: { studyId: s.study.id, participantId: 'PN-001' } });
    expect(served?.source).toBe('page');
    const responses = Object.fromEntries(seen.map((id) => [id, choose(s, id)]));
    expect(served!.responses).toEqual(responses);
    const expected = serveParticipant(s.version.content, s.bank, { participantId: 'PN-001', responses, locate: s.locate });
    const items = (served!.result as { items: Array<{ id: string }> }).items;
    expect(items.map((i) => i.id)).toEqual(expected.items.map((i) => i.id));
    expect((served!.result as { attentionCheck: string }).attentionCheck).toBe('passed');
    expect((await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'PN-001' } }))?.status).toBe('served');

    for (const item of items) {
      expect(state.step.kind === 'choice' && state.step.choice.itemId).toBe(item.id);
      expect(state.step.kind === 'choice' && state.step.choice.block).toBe('probe');
      state = (await api.post(answer(state, item.id === 'check-probe' ? 'sooner' : 'later'), consent.cookie)).body;
    }
    expect(state.step).toEqual({ kind: 'complete', completion: { code: 'HARBOUR-42', redirectUrl: 'https://panel.example.org/done?study=7&pid=PN-001' } });
    const answers = await Stage2Answer.findAll({ where: { participantRef: served!.id } });
    expect(answers).toHaveLength(items.length);
    expect(answers.every((a) => a.source === 'page' && a.responseMs === 900 && a.sideShown !== null)).toBe(true);
    const statuses = await listSessionStatuses(s.study.id, { idleMinutes: 60 });
    expect(statuses.find((r) => r.participantId === 'PN-001')).toMatchObject({ status: 'completed', answered: items.length, itemCount: items.length, source: 'page' });
    // the completed session reads as completed again after a reload
    expect((await api.get('PN-001', consent.cookie)).body.step.kind).toBe('complete');
  });

  it('shows operators each link with its sessions by status and the failed attention checks', async () => {
    const link = await createLink(s, s.team.operator, { name: 'Attention wave' });
    const api = participantApi(link.slug);
    await startedSession(api, 'PN-ATT');
    const listed = async () => {
      const response = await linksGet(await requestAs(s.team.operator, 'GET', `/api/studies/${s.study.id}/session-links`), ctx({ id: String(s.study.id) }));
      const { links } = (await response.json()) as { links: Array<{ id: number; counts: Record<string, number>; attentionFailures: unknown[] }> };
      return links.find((l) => l.id === link.id)!;
    };
    expect((await listed()).counts.started).toBe(1);
    // a participant who takes the dominated (later) option of the calibration check
    const other = await startedSession(api, 'PN-FAIL');
    let state = other.state;
    while (state.step.kind === 'choice' && state.step.choice.block === 'calibration') {
      state = (await api.post(answer(state, state.step.choice.itemId === 'check-calibration' ? 'later' : choose(s, state.step.choice.itemId)), other.cookie)).body;
    }
    const mine = await listed();
    expect(mine.attentionFailures).toEqual([{ participantId: 'PN-FAIL', checks: ['calibration'] }]);
    expect(mine.counts).toMatchObject({ started: 1, served: 1 });
    // the stage-2 check answered with its dominated (later) option too, then the block finished
    while (state.step.kind === 'choice') state = (await api.post(answer(state, 'later'), other.cookie)).body;
    const finished = await listed();
    expect(finished.attentionFailures).toEqual([{ participantId: 'PN-FAIL', checks: ['calibration', 'stage 2'] }]);
    expect(finished.counts).toMatchObject({ started: 1, served: 0, completed: 1 });
    // the checks are no choices of the analysis: the participant's data holds pairs only
    const data = await loadStudyData(s.study.id, s.version);
    const failed = data.find((p) => p.participantId === 'PN-FAIL')!;
    expect(failed.attentionCheck).toBe('failed');
    expect(failed.pairs.flatMap((q) => [q.far.itemId, q.near.itemId]).some((id) => id.startsWith('check-'))).toBe(false);
    expect(failed.calibration.some((c) => c.itemId.startsWith('check-'))).toBe(false);
  });

  it('records creating, pausing and closing a link in the audit trail', async () => {
    const link = await createLink(s, s.team.operator, { name: 'Audited wave' });
    for (const status of ['paused', 'closed']) {
      const response = await linkPatch(await requestAs(s.team.owner, 'PATCH', `/api/studies/${s.study.id}/session-links/${link.id}`, { json: { status } }), ctx({ id: String(s.study.id), linkId: String(link.id) }));
      expect(response.status).toBe(200);
    }
    const events = await AuditEvent.findAll({ where: { studyId: s.study.id }, order: [['id', 'ASC']] });
    const mine = events.filter((e) => (e.details as { linkId?: number }).linkId === link.id).map((e) => [e.action, e.actorId, (e.details as { to?: string }).to ?? null]);
    expect(mine).toEqual([
      ['session-link.create', s.team.operator.id, null],
      ['session-link.status', s.team.owner.id, 'paused'],
      ['session-link.status', s.team.owner.id, 'closed'],
    ]);
  });

  describe('error statuses', () => {
    it('answers 404 for an unknown link, on the page API and the page', async () => {
      const api = participantApi('NoSuchLinkAtAll000000');
      expect((await api.get('P1')).status).toBe(404);
      expect((await api.post({ action: 'consent', participantId: 'P1', agree: true })).status).toBe(404);
    });

    it('bad input: a missing or malformed participant id is 422 naming the field', async () => {
      const link = await createLink(s, s.team.operator);
      const api = participantApi(link.slug);
      for (const bad of [null, '', 'has space', 'x'.repeat(129), '<script>']) {
        const got = await api.get(bad);
        expect(got.status, String(bad)).toBe(422);
        expect(got.body.issues?.[0]?.path).toBe('pid');
      }
      const post = await api.post({ action: 'consent', participantId: 'bad id', agree: true });
      expect(post.status).toBe(422);
      expect(post.body.issues?.[0]?.path).toBe('participantId');
      const noAgree = await api.post({ action: 'consent', participantId: 'P1', agree: false });
      expect(noAgree.status).toBe(422);
      expect(noAgree.body.issues?.[0]?.path).toBe('agree');
      const unknownAction = await api.post({ action: 'skip', participantId: 'P1' });
      expect(unknownAction.status).toBe(422);
      expect((await api.post({ action: 'answer', participantId: 'P1', itemId: 'x', chosen: 'maybe' })).body.issues?.[0]?.path).toBe('chosen');
    });

    it('a paused link shows its step and refuses answers with 409; reopened it resumes; closed it is 410 for good', async () => {
      const link = await createLink(s, s.team.operator);
      const api = participantApi(link.slug);
      const { cookie, state } = await startedSession(api, 'PN-PAUSE');
      const patch = async (status: string) =>
        linkPatch(await requestAs(s.team.operator, 'PATCH', `/api/studies/${s.study.id}/session-links/${link.id}`, { json: { status } }), ctx({ id: String(s.study.id), linkId: String(link.id) }));
      expect((await patch('paused')).status).toBe(200);
      expect((await api.get('PN-PAUSE', cookie)).body.step).toEqual({ kind: 'unavailable', reason: 'paused' });
      expect((await api.get('PN-NEW')).body.step).toEqual({ kind: 'unavailable', reason: 'paused' });
      const refused = await api.post(answer(state, 'sooner'), cookie);
      expect(refused.status).toBe(409);
      expect(refused.body.error).toContain('paused');
      expect((await patch('open')).status).toBe(200);
      expect((await api.get('PN-PAUSE', cookie)).body.step).toEqual(state.step);
      expect((await patch('closed')).status).toBe(200);
      expect((await api.post(answer(state, 'sooner'), cookie)).status).toBe(410);
      expect((await api.get('PN-PAUSE', cookie)).body.step).toEqual({ kind: 'unavailable', reason: 'closed' });
      expect((await patch('open')).status, 'a closed link stays closed').toBe(409);
      expect((await patch('archived')).status).toBe(422);
    });

    it('answering an item that is not the current one is 409 with the current step (a stale tab)', async () => {
      const link = await createLink(s, s.team.operator);
      const api = participantApi(link.slug);
      const { cookie, state } = await startedSession(api, 'PN-STALE');
      const other = s.bank.items.find((i) => i.block === 'calibration' && state.step.kind === 'choice' && i.id !== state.step.choice.itemId)!;
      const wrong = await api.post({ ...answer(state, 'later'), itemId: other.id }, cookie);
      expect(wrong.status).toBe(409);
      expect(wrong.body.error).toContain('not the current question');
      expect(wrong.body.state?.step).toEqual(state.step);
      const probe = await api.post({ ...answer(state, 'later'), itemId: 'probe-1-far' }, cookie);
      expect(probe.status, 'a stage-2 item before the calibration block is done').toBe(409);
      // a second tab answered the current item; the first tab's later answer to it is a replay or a conflict
      const tab2 = await api.post(answer(state, 'later'), cookie);
      expect(tab2.status).toBe(200);
      const replay = await api.post(answer(state, 'later'), cookie);
      expect(replay.status).toBe(200);
      expect(replay.body.notice).toContain('already recorded');
      expect(replay.body.step).toEqual(tab2.body.step);
      const changed = await api.post(answer(state, 'sooner'), cookie);
      expect(changed.status).toBe(409);
      expect(changed.body.error).toContain('different answer');
      expect(changed.body.state?.step).toEqual(tab2.body.step);
      const stored = await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'PN-STALE' } });
      expect(Object.keys(stored!.calibrationAnswers ?? {})).toHaveLength(1);
    });

    it('a changed stage-2 answer is 409 and the first answer stays', async () => {
      const link = await createLink(s, s.team.operator);
      const api = participantApi(link.slug);
      const session = await startedSession(api, 'PN-S2');
      let state = session.state;
      while (state.step.kind === 'choice' && state.step.choice.block === 'calibration') state = (await api.post(answer(state, choose(s, state.step.choice.itemId)), session.cookie)).body;
      const first = state;
      state = (await api.post(answer(first, 'later'), session.cookie)).body;
      const changed = await api.post(answer(first, 'sooner'), session.cookie);
      expect(changed.status).toBe(409);
      expect(changed.body.error).toContain('different answer');
      expect(changed.body.state?.step).toEqual(state.step);
      const served = await Participant.findOne({ where: { studyId: s.study.id, participantId: 'PN-S2' } });
      const rows = await Stage2Answer.findAll({ where: { participantRef: served!.id } });
      expect(rows.map((r) => [r.itemId, r.chosen])).toEqual([[first.step.kind === 'choice' ? first.step.choice.itemId : '', 'LL']]);
    });

    it('without its session cookie a participant cannot act, and nobody can act as a participant started elsewhere', async () => {
      const link = await createLink(s, s.team.operator);
      const api = participantApi(link.slug);
      const { cookie, state } = await startedSession(api, 'PN-OWN');
      const noCookie = await api.post(answer(state, 'later'));
      expect(noCookie.status, 'another browser knowing the id').toBe(403);
      expect(noCookie.body.error).toContain('another browser');
      expect((await api.get('PN-OWN')).status).toBe(403);
      expect((await api.post({ action: 'consent', participantId: 'PN-OWN', agree: true })).status).toBe(403);
      const forged = await api.post(answer(state, 'later'), 'sb_session=forged-token-forged-token-forged');
      expect(forged.status).toBe(403);
      // the cookie of one participant does not act for another id
      const otherId = await api.post({ ...answer(state, 'later'), participantId: 'PN-SOMEONE' }, cookie);
      expect(otherId.status).toBe(409);
      expect(otherId.body.state?.step).toEqual({ kind: 'consent' });
      // a write from another origin never reaches the session (cross-site protection)
      const crossSite = await api.post(answer(state, 'later'), cookie, { origin: 'http://evil.example.test' });
      expect(crossSite.status).toBe(403);
      expect(crossSite.body.error).toContain('cross-site protection');
      const formBody = await api.post(answer(state, 'later'), cookie, { 'content-type': 'text/plain' });
      expect(formBody.status).toBe(403);
      const stored = await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'PN-OWN' } });
      expect(stored!.calibrationAnswers ?? {}).toEqual({});
    });

    it('rate-limits each address per link with 429 and Retry-After', async () => {
      pageRateLimiter.reset();
      // a burst of 120 passes, then the bucket refills at 10 a second: 160 requests at once cannot all pass
      const responses = await Promise.all(Array.from({ length: 160 }, async () => pageGet(await requestAs(null, 'GET', '/api/session-page/RateLimitedLink0000000?participantId=P1'), ctx({ slug: 'RateLimitedLink0000000' }))));
      const statuses = responses.map((r) => r.status);
      expect(statuses.filter((st) => st === 404).length).toBeGreaterThanOrEqual(120);
      const limited = responses.find((r) => r.status === 429);
      expect(limited, 'some requests were limited').toBeDefined();
      expect(Number(limited!.headers.get('retry-after'))).toBeGreaterThan(0);

      pageRateLimiter.reset();
    });
  });

  it('50 parallel submissions of the same answer record it once (calibration and stage 2)', async () => {
    const link = await createLink(s, s.team.operator);
    const api = participantApi(link.slug);
    const { cookie, state: started } = await startedSession(api, 'PN-PAR');
    let state = started;
    const calibrationReplies = await Promise.all(Array.from({ length: 50 }, () => api.post(answer(state, 'later'), cookie)));
    expect(calibrationReplies.every((r) => r.status === 200)).toBe(true);
    const stored = await ParticipantSession.findOne({ where: { studyId: s.study.id, participantId: 'PN-PAR' } });
    expect(stored!.calibrationAnswers).toEqual({ [state.step.kind === 'choice' ? state.step.choice.itemId : '']: 'later' });
    state = calibrationReplies[0]!.body;
    while (state.step.kind === 'choice' && state.step.choice.block === 'calibration') state = (await api.post(answer(state, choose(s, state.step.choice.itemId)), cookie)).body;
    pageRateLimiter.reset();
    const replies = await Promise.all(Array.from({ length: 50 }, () => api.post(answer(state, 'later'), cookie)));
    expect(replies.every((r) => r.status === 200)).toBe(true);
    const served = await Participant.findOne({ where: { studyId: s.study.id, participantId: 'PN-PAR' } });
    expect(await Stage2Answer.count({ where: { participantRef: served!.id } })).toBe(1);
    // every reply names the same next item
    expect(new Set(replies.map((r) => JSON.stringify(r.body.step))).size).toBe(1);
  });

  it('a preview runs the whole session for a team member and stores nothing', async () => {
    const link = await createLink(s, s.team.operator);
    const before = { sessions: await ParticipantSession.count(), participants: await Participant.count(), answers: await Stage2Answer.count() };
    const preview = async (user: TestUser, body: unknown) =>
      previewPost(await requestAs(user, 'POST', `/api/studies/${s.study.id}/session-links/${link.id}/preview`, { json: body }), ctx({ id: String(s.study.id), linkId: String(link.id) }));
    const state = { consented: true, begun: true, calibration: {} as Record<string, string>, stage2: {} as Record<string, string> };
    let step = ((await (await preview(s.team.operator, state)).json()) as PageState).step;
    let guard = 0;
    while (step.kind === 'choice' && guard++ < 200) {
      const target = step.choice.block === 'calibration' ? state.calibration : state.stage2;
      target[step.choice.itemId] = step.choice.itemId.startsWith('check-') ? 'sooner' : choose(s, step.choice.itemId);
      const response = await preview(s.team.operator, state);
      expect(response.status).toBe(200);
      step = ((await response.json()) as PageState).step;
    }
    expect(step).toEqual({ kind: 'complete', completion: { code: 'HARBOUR-42', redirectUrl: 'https://panel.example.org/done?study=7&pid=preview' } });
    expect({ sessions: await ParticipantSession.count(), participants: await Participant.count(), answers: await Stage2Answer.count() }).toEqual(before);
    expect((await preview(s.team.viewer, state)).status, 'viewers cannot preview').toBe(403);
    expect((await preview(s.team.operator, { ...state, calibration: { x: 'perhaps' } })).status).toBe(422);
  });

  it('bad input: link settings are checked, naming the field', async () => {
    const post = async (json: Record<string, unknown>) =>
      linksPost(await requestAs(s.team.operator, 'POST', `/api/studies/${s.study.id}/session-links`, { json: { designVersionId: s.version.id, name: 'x', title: 'x', consentText: 'c', instructions: 'i', ...json } }), ctx({ id: String(s.study.id) }));
    for (const [field, value] of [
      ['redirectUrl', 'javascript:alert(1)'],
      ['redirectUrl', 'ftp://panel.example.org'],
      ['participantParam', '1pid'],
      ['completionCode', 'has space'],
      ['consentText', '   '],
      ['name', ''],
    ] as const) {
      const response = await post({ [field]: value });
      expect(response.status, `${field}: ${value}`).toBe(422);
      expect(((await response.json()) as { issues: Array<{ path: string }> }).issues[0]!.path).toBe(field);
    }
    const otherStudy = await setUp('Other study for links');
    expect((await post({ designVersionId: otherStudy.version.id })).status, "another study's version").toBe(404);
    const generated = await SessionLink.findOne({ where: { id: (await createLink(s, s.team.operator, { completionCode: '' })).id } });
    expect(generated!.completionCode).toMatch(/^[0-9A-F]{12}$/);
  });
});
