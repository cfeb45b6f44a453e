// The endpoints behind a design's numbers, fed the extremes each schema field allows: saving,
// the summary, freezing, the item-bank preview and starting a power run answer 2xx or 4xx (a
// 422 naming the field), never 500. (tests/unit/security/schema-extremes sweeps the same
// functions over every field and corner; this walks the HTTP path end to end.)
import { beforeAll, describe, expect, it } from 'vitest';
import { POST as createPrior } from '@/app/api/studies/[id]/priors/route';
import { POST as createDesign } from '@/app/api/studies/[id]/designs/route';
import { GET as getSummary } from '@/app/api/studies/[id]/designs/[designId]/summary/route';
import { POST as freeze } from '@/app/api/studies/[id]/designs/[designId]/freeze/route';
import { GET as preview } from '@/app/api/studies/[id]/item-bank/[versionId]/route';
import { POST as startRun } from '@/app/api/studies/[id]/power-runs/route';
import { GET as getRun } from '@/app/api/studies/[id]/power-runs/[runId]/route';
import { defaultSpec } from '@/lib/shared/planner/design-form-values';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';

beforeAll(migrateUp);

type Requester = (method: string, path: string, json?: unknown) => ReturnType<typeof requestAs>;

async function readRun(as: Requester, id: string, runId: string): Promise<{ status: string; message?: string | null }> {
  return ((await (await getRun(await as('GET', `/power-runs/${runId}`), ctx({ id, runId }))).json()) as { run: { status: string; message?: string | null } }).run;
}

const prior = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 };
const TINY = [Number.MIN_VALUE, 1e-300];

// field → [model, values]: what each open or closed bound lets a caller send.
const CASES: Array<{ label: string; prior?: Partial<typeof prior>; spec?: Record<string, unknown>; truth?: Record<string, unknown> }> = [
  ...TINY.flatMap((v) => [
    { label: `power-delay s=${v}`, spec: { model: { id: 'power-delay', sensitivity: v } } },
    { label: `exponential-power s=${v}`, spec: { model: { id: 'exponential-power', sensitivity: v } }, truth: { model: { id: 'exponential-power', sensitivity: v } } },
    { label: `quasi-hyperbolic β=${v}`, spec: { model: { id: 'quasi-hyperbolic', presentBias: v } } },
    { label: `ratio=${v}`, spec: { ratio: v } },
    { label: `largeAmount=${v}`, spec: { largeAmount: v } },
    { label: `choiceSensitivity=${v}`, spec: { choiceSensitivity: v }, truth: { gamma: v } },
    { label: `medians=${v}`, prior: { medianSmall: v, medianLarge: v }, truth: { prior: { ...prior, medianSmall: v, medianLarge: v } } },
  ]),
  { label: 'ratio just below 1', spec: { ratio: 0.9999999999999999 } },
  { label: 'widest spreads and correlation', prior: { sdLogSmall: 5, sdLogLarge: 5, correlation: 0.99 } },
  { label: 'longest delays', spec: { lateDelayLimit: 9131, soonDelay: { mode: 'fixed', days: 365 }, calibration: { itemsPerMagnitude: 40, minDelay: 1, maxDelay: 9131 } } },
];

describe('schema-accepted extremes through the endpoints', () => {
  for (const c of CASES) {
    it(`${c.label}: 2xx or 4xx, never 5xx, and a started run finishes`, async () => {
      const { study, team } = await makeStudyWithTeam(`Extremes ${c.label}`);
      const id = String(study.id);
      const as = (method: string, path: string, json?: unknown) => requestAs(team.editor, method, `/api/studies/${id}${path}`, json === undefined ? {} : { json });
      const statuses: Record<string, number> = {};

      const priorReply = await createPrior(await as('POST', '/priors', { name: 'Edge prior', ...prior, ...c.prior }), ctx({ id }));
      statuses.prior = priorReply.status;
      if (priorReply.status >= 300) return void expect(priorReply.status, JSON.stringify(statuses)).toBeLessThan(500);
      const priorId = ((await priorReply.json()) as { prior: { id: number } }).prior.id;

      const spec = { ...defaultSpec('Edge design', priorId), ...c.spec };
      const designReply = await createDesign(await as('POST', '/designs', spec), ctx({ id }));
      statuses.design = designReply.status;
      if (designReply.status < 300) {
        const designId = String(((await designReply.json()) as { design: { id: number } }).design.id);
        statuses.summary = (await getSummary(await as('GET', `/designs/${designId}/summary`), ctx({ id, designId }))).status;
        const frozen = await freeze(await as('POST', `/designs/${designId}/freeze`), ctx({ id, designId }));
        statuses.freeze = frozen.status;
        if (frozen.status < 300) {
          const versionId = String(((await frozen.json()) as { version: { id: number } }).version.id);
          statuses.preview = (await preview(await requestAs(team.operator, 'GET', `/api/studies/${id}/item-bank/${versionId}`), ctx({ id, versionId }))).status;
          const truth = { model: spec.model, prior: { ...prior, ...c.prior }, gamma: 10, lapse: 0.02, ...c.truth };
          const run = await startRun(
            await as('POST', '/power-runs', { designVersionId: Number(versionId), truth, calibration: 'simulated', test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' }, sampleSizes: [5], replications: 10, seed: 1 }),
            ctx({ id }),
          );
          statuses.power = run.status;
          if (run.status < 300) {
            // A start that was accepted must end in a finished run, not one that fails in the worker.
            const runId = String(((await run.json()) as { run: { id: number } }).run.id);
            const deadline = Date.now() + 90_000;
            let stored = await readRun(as, id, runId);
            while ((stored.status === 'queued' || stored.status === 'running') && Date.now() < deadline) {
              await new Promise((resolve) => setTimeout(resolve, 150));
              stored = await readRun(as, id, runId);
            }
            expect(stored.status, `${c.label}: ${stored.message ?? ''}`).toBe('finished');
          }
        }
      }
      for (const [step, status] of Object.entries(statuses)) expect(status, `${step} in ${JSON.stringify(statuses)}`).toBeLessThan(500);
    });
  }
});
