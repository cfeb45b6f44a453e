// Every per-person export leaves the app with the caution: the participants, sessions, batch and
// analysis CSVs as a last column on every row of a plain table (no comment lines, so spreadsheets
// and survey tools import them as they are), and their JSON replies as a `caution` field.
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { GET as participants } from '@/app/api/studies/[id]/participants/route';
import { POST as batch } from '@/app/api/studies/[id]/participants/batch/route';
import { GET as sessions } from '@/app/api/studies/[id]/sessions/route';
import { POST as upload } from '@/app/api/studies/[id]/observed-choices/route';
import { POST as createAnalysis } from '@/app/api/studies/[id]/analyses/route';
import { GET as exportAnalysis } from '@/app/api/studies/[id]/analyses/[analysisId]/export/route';
import { PERSON_CAUTION } from '@/lib/shared/cautions';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { serveProbeItems, type ProbeItemsReply } from '@/lib/server/services/participants';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';

type Exports = Record<string, () => Promise<Response>>;

function expectCautionColumn(name: string, text: string) {
  expect(text.startsWith('#'), `${name} starts with a comment line`).toBe(false);
  const parsed = Papa.parse<Record<string, string>>(text.trim(), { header: true });
  expect(parsed.errors, name).toEqual([]);
  expect(parsed.meta.fields?.at(-1), name).toBe('caution');
  expect(parsed.data.length, name).toBeGreaterThan(0);
  expect(new Set(parsed.data.map((r) => r.caution)), name).toEqual(new Set([PERSON_CAUTION]));
}

describe('per-person exports', () => {
  const csv: Exports = {};
  const json: Exports = {};

  beforeAll(async () => {
    await migrateUp();
    const { study, team } = await makeStudyWithTeam('Person exports study');
    const version = await makeFrozenVersion(study.id);
    const { bank } = bankFor(version);
    const replies: ProbeItemsReply[] = [];
    for (const [i, rates] of [{ kSmall: 0.05, kLarge: 0.01 }, { kSmall: 0.03, kLarge: 0.008 }, { kSmall: 0.08, kLarge: 0.02 }].entries()) {
      replies.push(await serveProbeItems(version, `X-${i + 1}`, answersOf(bank.items, rates), { source: 'batch', userId: team.operator.id }));
    }
    const lines = ['participant,item,choice', ...replies.flatMap((r, p) => r.items.map((item) => `X-${p + 1},${item.id},${item.view === 'far' ? 'later' : 'sooner'}`))];
    const uploaded = await upload(await requestAs(team.operator, 'POST', `/api/studies/${study.id}/observed-choices`, { body: `${lines.join('\n')}\n`, headers: { 'content-type': 'text/csv' } }), ctx({ id: String(study.id) }));
    expect(uploaded.status).toBe(200);
    const made = await createAnalysis(
      await requestAs(team.editor, 'POST', `/api/studies/${study.id}/analyses`, { json: { name: 'Caution check', designVersionId: version.id, exclusions: { attentionCheck: false, flaggedEstimates: false, incompleteBlocks: false, responseTimeFloor: { enabled: false, ms: 200 } }, alternative: 'greater' } }),
      ctx({ id: String(study.id) }),
    );
    expect(made.status).toBe(201);
    const analysisId = String((await made.json()).analysis.id);
    const id = String(study.id);
    // eslint-disable-next-line @typescript-eslint/no-explicit-any -- route handlers differ only in their params' type
    const get = (handler: (request: any, context: any) => Promise<Response>, path: string, params: Record<string, string> = { id }) => async () => handler(await requestAs(team.viewer, 'GET', path), ctx(params));
    const sheet = [`participantId,${Object.keys(answersOf(bank.items, { kSmall: 0.05, kLarge: 0.01 })).join(',')}`, `X-1,${Object.values(answersOf(bank.items, { kSmall: 0.05, kLarge: 0.01 })).join(',')}`].join('\n');
    const postBatch = (query: string) => async () => batch(await requestAs(team.operator, 'POST', `/api/studies/${id}/participants/batch${query}`, { json: { designVersionId: version.id, csv: sheet } }), ctx({ id }));
    csv.participants = get(participants, `/api/studies/${id}/participants?format=csv`);
    csv.sessions = get(sessions, `/api/studies/${id}/sessions?format=csv`);
    csv.batch = postBatch('?format=csv');
    csv.analysis = get(exportAnalysis, `/api/studies/${id}/analyses/${analysisId}/export?format=csv`, { id, analysisId });
    json.participants = get(participants, `/api/studies/${id}/participants`);
    json.sessions = get(sessions, `/api/studies/${id}/sessions`);
    json.batch = postBatch('');
    json.analysis = get(exportAnalysis, `/api/studies/${id}/analyses/${analysisId}/export?format=json`, { id, analysisId });
  });

  it.each(['participants', 'sessions', 'batch', 'analysis'])('the %s CSV ends every row with the caution column', async (name) => {
    const reply = await csv[name]();
    expect(reply.status).toBe(200);
    expect(reply.headers.get('content-type')).toContain('text/csv');
    expectCautionColumn(name, await reply.text());
  });

  it.each(['participants', 'sessions', 'batch', 'analysis'])('the %s JSON reply carries the caution', async (name) => {
    const reply = await json[name]();
    expect(reply.status).toBe(200);
    expect(String((await reply.json()).caution)).toContain('not a clinical assessment');
  });
});
