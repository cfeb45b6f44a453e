// Power runs with REDIS_URL set but no queue worker listening. A run started with none computes in
// the web process (as an analysis's refits do) and says so; a run whose workers all leave mid-run
// says it waits for a queue worker, and continues with the same tallies once one listens again.
import { beforeAll, describe, expect, it } from 'vitest';
import { GET as getRun } from '@/app/api/studies/[id]/power-runs/[runId]/route';
import { GET as listRuns, POST as startRun } from '@/app/api/studies/[id]/power-runs/route';
import { buildScenario } from '@/lib/shared/power-scenario';
import { RAN_IN_PROCESS_MESSAGE, WAITING_FOR_WORKER_MESSAGE } from '@/lib/shared/power-queue';
import { runScenario } from '@/lib/server/jobs/power/run-scenario';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';
import { freezeQueuedDesign, queueWorkersOfFile, QUEUED_DESIGN, QUEUED_RUN } from '../support/power-queue';
import { startQueueWorker } from '../support/processes';

const content = QUEUED_DESIGN;
const spec = { ...QUEUED_RUN, seed: 11 };

type RunDto = { id: number; status: string; completed: number; message: string | null; result: { summary: { points: Array<{ rejections: number }> } } | null };
const workers = queueWorkersOfFile();
let studyId: number;
let versionId: number;
let editor: TestUser;
let viewer: TestUser;

beforeAll(async () => {
  await migrateUp();
  const { study, team } = await makeStudyWithTeam('Power runs without a queue worker');
  studyId = study.id;
  editor = team.editor;
  viewer = team.viewer;
  versionId = (await freezeQueuedDesign(study.id, team.owner.id)).id;
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
    workers.push(await startQueueWorker());
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
