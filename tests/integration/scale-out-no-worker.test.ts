// Power runs with REDIS_URL set but no queue worker listening. A run started with none computes in
// the web process (as an analysis's refits do) and says so; a run whose workers all leave mid-run
// says it waits for a queue worker, and continues with the same tallies once one listens again.
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { GET as getRun } from '@/app/api/studies/[id]/power-runs/[runId]/route';
import { GET as listRuns, POST as startRun } from '@/app/api/studies/[id]/power-runs/route';
import { Design, DesignVersion, PriorSet } from '@/db/models';
import { contentHash } from '@/lib/shared/canonical-json';
import { buildScenario } from '@/lib/shared/power-scenario';
import { RAN_IN_PROCESS_MESSAGE, WAITING_FOR_WORKER_MESSAGE } from '@/lib/shared/power-queue';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import { runScenario } from '@/lib/server/jobs/power/run-scenario';
import { closeSharedRedis } from '@/lib/server/redis';
import { POWER_PRIOR, powerDesign } from '../support/frozen-design';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';
import { startQueueWorker, testRedisUrl, type Child } from '../support/processes';

const content: FrozenDesign = powerDesign({ lateDelayLimit: 3650, calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 365 } });
const spec = {
  label: 'As the design assumes',
  truth: { model: { id: 'hyperbolic' as const }, prior: POWER_PRIOR, gamma: 10, lapse: 0.02 },
  calibration: 'simulated' as const,
  test: { kind: 'mcnemar' as const, alpha: 0.05, alternative: 'greater' as const },
  sampleSizes: [5, 10, 20, 40],
  seed: 11,
};

type RunDto = { id: number; status: string; completed: number; message: string | null; result: { summary: { points: Array<{ rejections: number }> } } | null };
let workers: Child[] = [];
let studyId: number;
let versionId: number;
let editor: TestUser;
let viewer: TestUser;

beforeAll(async () => {
  process.env.REDIS_URL = testRedisUrl();
  await migrateUp();
  const { study, team } = await makeStudyWithTeam('Power runs without a queue worker');
  studyId = study.id;
  editor = team.editor;
  viewer = team.viewer;
  const priorSet = await PriorSet.create({ studyId: study.id, name: 'Pilot prior', values: POWER_PRIOR, source: 'manual', notes: '', createdBy: team.owner.id });
  const designSpec = { ...content.spec, priorSetId: priorSet.id };
  const design = await Design.create({ studyId: study.id, name: designSpec.name, spec: designSpec, createdBy: team.owner.id });
  const frozen = { spec: designSpec, prior: content.prior };
  versionId = (await DesignVersion.create({ designId: design.id, studyId: study.id, number: 1, hash: contentHash(frozen), content: frozen, frozenBy: team.owner.id })).id;
});
afterEach(async () => {
  await Promise.all(workers.map((w) => w.stop()));
  workers = [];
});
afterAll(async () => {
  delete process.env.REDIS_URL;
  await closeSharedRedis();
});

async function start(replications: number): Promise<number> {
  const response = await startRun(await requestAs(editor, 'POST', `/api/studies/${studyId}/power-runs`, { json: { ...spec, replications, designVersionId: versionId } }), ctx({ id: String(studyId) }));
  expect(response.status).toBe(202);
  return ((await response.json()) as { run: { id: number } }).run.id;
}

async function read(runId: number): Promise<RunDto> {
  const reply = await getRun(await requestAs(viewer, 'GET', `/api/studies/${studyId}/power-runs/${runId}`), ctx({ id: String(studyId), runId: String(runId) }));
  return ((await reply.json()) as { run: RunDto }).run;
}

/** Reads the run until `done` holds of it, at most `ms`; returns the last read. */
async function readUntil(runId: number, done: (run: RunDto) => boolean, ms: number): Promise<RunDto> {
  const deadline = Date.now() + ms;
  let run = await read(runId);
  while (!done(run) && Date.now() < deadline) {
    await new Promise((resolve) => setTimeout(resolve, 200));
    run = await read(runId);
  }
  return run;
}

/** The tallies of the same run computed in this process, one thread. */
async function inProcessRejections(replications: number): Promise<number[]> {
  const outcome = await runScenario(buildScenario({ ...spec, replications, designVersionId: 1 } as never, content), { workers: 1 });
  return outcome!.tally.rejections;
}

describe('power runs on the shared queue without a queue worker', () => {
  it('computes a run started while no worker listens in the web process, and says so', async () => {
    const runId = await start(240);
    const run = await readUntil(runId, (r) => r.status === 'finished', 60_000);
    expect(run.status).toBe('finished');
    expect(run.completed).toBe(240);
    expect(run.message).toBe(RAN_IN_PROCESS_MESSAGE);
    expect(run.result!.summary.points.map((p) => p.rejections)).toEqual(await inProcessRejections(240));
  }, 90_000);

  it('says it waits for a queue worker when its only worker leaves mid-run, and finishes with the same tallies once one listens again', async () => {
    workers = [await startQueueWorker()];
    const runId = await start(2000);
    await workers[0].waitFor(/power chunk \d+ of \S+ done/);
    workers[0].process.kill('SIGKILL');
    const waiting = await readUntil(runId, (r) => r.message === WAITING_FOR_WORKER_MESSAGE || r.status !== 'running', 20_000);
    expect(waiting.status).toBe('running');
    expect(waiting.message).toBe(WAITING_FOR_WORKER_MESSAGE);
    expect(waiting.completed).toBeLessThan(2000);
    // the power list shows the same state (its row says so from the message)
    const list = (await (await listRuns(await requestAs(viewer, 'GET', `/api/studies/${studyId}/power-runs`), ctx({ id: String(studyId) }))).json()) as { runs: RunDto[] };
    expect(list.runs.find((r) => r.id === runId)?.message).toBe(WAITING_FOR_WORKER_MESSAGE);

    workers.push(await startQueueWorker());
    const run = await readUntil(runId, (r) => r.status === 'finished', 120_000);
    expect(run.status).toBe('finished');
    expect(run.message).toBeNull();
    expect(run.result!.summary.points.map((p) => p.rejections)).toEqual(await inProcessRejections(2000));
  }, 180_000);
});
