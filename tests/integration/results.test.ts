// Results on the real MariaDB: the observed-choices upload (long-format CSV) with its line-and-
// column errors, idempotency, conflict report and all-or-nothing import; then a saved, versioned
// analysis citing the frozen design's hash, and its downloads.
import { beforeAll, describe, expect, it } from 'vitest';
import { Analysis, ParticipantSession, Stage2Answer } from '@/db/models';
import { POST as upload, GET as observed } from '@/app/api/studies/[id]/observed-choices/route';
import { POST as createAnalysis, GET as listAnalyses } from '@/app/api/studies/[id]/analyses/route';
import { GET as exportAnalysis } from '@/app/api/studies/[id]/analyses/[analysisId]/export/route';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { serveProbeItems, type ProbeItemsReply } from '@/lib/server/services/participants';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';
import { startQueueWorker, testRedisUrl } from '../support/processes';
import { closeSharedRedis } from '@/lib/server/redis';

type Setup = Awaited<ReturnType<typeof setUp>>;

async function setUp() {
  const { study, team } = await makeStudyWithTeam('Results study');
  const version = await makeFrozenVersion(study.id);
  const { bank } = bankFor(version);
  const replies: ProbeItemsReply[] = [];
  for (const [i, rates] of [{ kSmall: 0.05, kLarge: 0.01 }, { kSmall: 0.03, kLarge: 0.008 }, { kSmall: 0.08, kLarge: 0.02 }, { kSmall: 0.04, kLarge: 0.006 }].entries()) {
    replies.push(await serveProbeItems(version, `R-${i + 1}`, answersOf(bank.items, rates), { source: 'batch', userId: team.operator.id }));
  }
  return { study, team, version, replies };
}

/** A long-format file answering every pair as a reversal (far view later, near view sooner). */
function fileFor(replies: ProbeItemsReply[], separator = ',', choice = (view: string | null) => (view === 'far' ? 'later' : 'sooner')): string {
  const lines = [['participant', 'item', 'choice', 'response_ms'].join(separator)];
  replies.forEach((r, p) => r.items.forEach((item) => lines.push([`R-${p + 1}`, item.id, choice(item.view), 1500].join(separator))));
  return `${lines.join('\n')}\n`;
}

async function send(s: Setup, text: string, as: 'operator' | 'viewer' = 'operator') {
  const response = await upload(await requestAs(s.team[as], 'POST', `/api/studies/${s.study.id}/observed-choices`, { body: text, headers: { 'content-type': 'text/csv' } }), ctx({ id: String(s.study.id) }));
  return { status: response.status, body: await response.json() };
}

describe('uploading observed choices', () => {
  let s: Setup;
  beforeAll(async () => {
    await migrateUp();
    s = await setUp();
  });

  it('names the line and column of every bad cell, and imports nothing', async () => {
    const text = 'participant,item,choice\nR-1,,later\nR-1,x,maybe\n';
    const { status, body } = await send(s, text);
    expect(status).toBe(422);
    expect(body.issues.map((i: { path: string }) => i.path)).toEqual(['line 2, item', 'line 3, choice']);
    expect(await Stage2Answer.count({ where: { studyId: s.study.id } })).toBe(0);
  });

  it('refuses unknown participants and items never served to them, by line, and imports nothing', async () => {
    const good = fileFor(s.replies.slice(0, 1));
    const text = `${good}ghost,pair-1-far,later\nR-2,cal-small-01,later\n`;
    const { status, body } = await send(s, text);
    expect(status).toBe(422);
    const lines = good.trim().split('\n').length;
    expect(body.issues).toEqual([
      { path: `line ${lines + 1}, participant`, message: expect.stringContaining('ghost') },
      { path: `line ${lines + 2}, item`, message: expect.stringContaining('was not served') },
    ]);
    expect(await Stage2Answer.count({ where: { studyId: s.study.id } })).toBe(0);
  });

  it('refuses a file that answers one item two ways', async () => {
    const item = s.replies[0].items[0].id;
    const { status, body } = await send(s, `participant,item,choice\nR-1,${item},later\nR-1,${item},sooner\n`);
    expect(status).toBe(422);
    expect(body.issues[0]).toMatchObject({ path: 'line 3, choice' });
  });

  it('reads a semicolon file with a byte-order mark, says so, and completes the participants in one transaction', async () => {
    const { status, body } = await send(s, `\uFEFF${fileFor(s.replies, ';')}`);
    expect(status).toBe(200);
    const total = s.replies.reduce((n, r) => n + r.items.length, 0);
    expect(body.report).toMatchObject({ rows: total, recorded: total, alreadyRecorded: 0, participants: 4, completedParticipants: 4, delimiter: ';', byteOrderMark: true });
    expect(body.report.notes.join(' ')).toMatch(/byte-order mark/);
    expect(await Stage2Answer.count({ where: { studyId: s.study.id, source: 'upload' } })).toBe(total);
    const sessions = await ParticipantSession.findAll({ where: { studyId: s.study.id } });
    expect(sessions.map((x) => x.status)).toEqual(['completed', 'completed', 'completed', 'completed']);
  });

  it('is idempotent per participant and item: the same file again records nothing', async () => {
    const { status, body } = await send(s, fileFor(s.replies));
    expect(status).toBe(200);
    expect(body.report).toMatchObject({ recorded: 0, alreadyRecorded: s.replies.reduce((n, r) => n + r.items.length, 0) });
  });

  it('refuses a conflicting re-upload with 409 and a report of each line, keeping the first answers', async () => {
    const { status, body } = await send(s, fileFor(s.replies.slice(0, 1), ',', () => 'later'));
    expect(status).toBe(409);
    expect(body.issues.length).toBeGreaterThan(0);
    expect(body.issues[0].path).toMatch(/^line \d+, choice$/);
    expect(body.issues[0].message).toContain('already has SS on record');
    expect(await Stage2Answer.count({ where: { studyId: s.study.id, chosen: 'SS' } })).toBe(s.replies.reduce((n, r) => n + r.items.filter((i) => i.view !== 'far').length, 0));
  });

  it('refuses a viewer with 403 and a body over 5 MB with 413', async () => {
    expect((await send(s, fileFor(s.replies), 'viewer')).status).toBe(403);
    const big = `participant,item,choice\n${'R-1,x,later\n'.repeat(500_000)}`;
    expect((await send(s, big)).status).toBe(413);
  });
});

describe('saved analyses', () => {
  let s: Setup;
  beforeAll(async () => {
    await migrateUp();
    s = await setUp();
    await send(s, fileFor(s.replies));
  });

  const body = (versionId: number) => ({
    name: 'Main analysis',
    designVersionId: versionId,
    exclusions: { attentionCheck: true, flaggedEstimates: false, incompleteBlocks: true, responseTimeFloor: { enabled: true, ms: 200 } },
    alternative: 'greater',
  });

  it('shows the counts each exclusion rule would remove before an analysis is run', async () => {
    const response = await observed(await requestAs(s.team.viewer, 'GET', `/api/studies/${s.study.id}/observed-choices?versionId=${s.version.id}`), ctx({ id: String(s.study.id) }));
    expect(response.status).toBe(200);
    const { summary } = await response.json();
    expect(summary).toMatchObject({ participants: 4, withAnswers: 4, complete: 4 });
    expect(summary.exclusions.map((r: { rule: string }) => r.rule)).toEqual(['attentionCheck', 'flaggedEstimates', 'incompleteBlocks', 'responseTimeFloor']);
  });

  it('saves a named analysis as version 1, then 2, citing the frozen design hash', async () => {
    const make = async () => createAnalysis(await requestAs(s.team.editor, 'POST', `/api/studies/${s.study.id}/analyses`, { json: body(s.version.id) }), ctx({ id: String(s.study.id) }));
    const first = await make();
    expect(first.status).toBe(201);
    const { analysis } = await first.json();
    expect(analysis).toMatchObject({ name: 'Main analysis', version: 1, designVersion: { id: s.version.id, hash: s.version.hash } });
    expect(analysis.result.participantsAnalysed).toBe(4);
    // every probe pair was answered LS: the sign test counts all 4 participants positive
    expect(analysis.result.tests.signTest).toMatchObject({ positive: 4, negative: 0 });
    expect(analysis.paragraph).toContain(s.version.hash);
    expect(analysis.paragraph).toContain('not a clinical assessment');
    const second = await (await make()).json();
    expect(second.analysis.version).toBe(2);
    expect(await Analysis.count({ where: { studyId: s.study.id } })).toBe(2);
    const list = await (await listAnalyses(await requestAs(s.team.viewer, 'GET', `/api/studies/${s.study.id}/analyses`), ctx({ id: String(s.study.id) }))).json();
    expect(list.analyses.map((a: { version: number }) => a.version)).toEqual([2, 1]);
  });

  it('saves the same analysis when its refits run on a queue worker process (REDIS_URL)', async () => {
    const make = async () => (await createAnalysis(await requestAs(s.team.editor, 'POST', `/api/studies/${s.study.id}/analyses`, { json: { ...body(s.version.id), name: 'Queued' } }), ctx({ id: String(s.study.id) }))).json();
    const here = (await make()).analysis;
    process.env.REDIS_URL = testRedisUrl();
    const worker = await startQueueWorker();
    try {
      const queued = (await make()).analysis;
      expect(worker.output()).toMatch(/analysis chunk 0 of \S+ done/);
      expect(queued.version).toBe(here.version + 1);
      expect(queued.result).toEqual(here.result);
    } finally {
      delete process.env.REDIS_URL;
      await worker.stop();
      await closeSharedRedis();
    }
  }, 120_000);

  it('refuses an analysis with an unknown field, naming it', async () => {
    const response = await createAnalysis(await requestAs(s.team.editor, 'POST', `/api/studies/${s.study.id}/analyses`, { json: { ...body(s.version.id), alpha: 2 } }), ctx({ id: String(s.study.id) }));
    expect(response.status).toBe(422);
    expect((await response.json()).issues[0].path).toBe('alpha');
  });

  it('downloads CSV through the formula guard, JSON with the caution, and both figures as SVG and PNG', async () => {
    const saved = await Analysis.findOne({ where: { studyId: s.study.id, version: 1 } });
    const get = async (format: string) =>
      exportAnalysis(await requestAs(s.team.viewer, 'GET', `/api/studies/${s.study.id}/analyses/${saved!.id}/export?format=${format}`), ctx({ id: String(s.study.id), analysisId: String(saved!.id) }));
    const csv = await get('csv');
    expect(csv.headers.get('content-type')).toContain('text/csv');
    const text = await csv.text();
    expect(text).toContain('not a clinical assessment');
    expect(text.split('\r\n').filter((l) => l.startsWith('R-')).length).toBe(4 * 6);
    const json = await (await get('json')).json();
    expect(json.caution).toContain('not a clinical assessment');
    expect(await (await get('patterns.svg')).text()).toContain('<svg');
    expect(await (await get('zones.svg')).text()).toContain('Where the reversal zone really was');
    const png = new Uint8Array(await (await get('patterns.png')).arrayBuffer());
    expect([...png.slice(1, 4)].map((c) => String.fromCharCode(c)).join('')).toBe('PNG');
    expect((await get('exe')).status).toBe(422);
  });
});
