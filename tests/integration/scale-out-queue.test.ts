// Power runs over the shared queue (REDIS_URL): worker processes of their own take the chunks, and
// the outcome must be exactly the in-process run's for the same seed (tallies are whole-number
// counts merged in chunk order, so any other outcome means a chunk was lost or counted twice).
import { beforeAll, describe, expect, it } from 'vitest';
import { Queue } from 'bullmq';
import { Redis } from 'ioredis';
import { GET as getRun } from '@/app/api/studies/[id]/power-runs/[runId]/route';
import { POST as startRun } from '@/app/api/studies/[id]/power-runs/route';
import { AuditEvent } from '@/db/models';
import { buildScenario } from '@/lib/shared/power-scenario';
import type { PowerScenario } from '@/lib/design/power/types';
import { runScenario } from '@/lib/server/jobs/power/run-scenario';
import { runRefitsOnQueue } from '@/lib/server/jobs/analysis/queue';
import { refitParticipant, simulateStudy } from '@/lib/design';
import { design as refitDesign, truth as refitTruth } from '../unit/analysis/support';
import { runScenariosOnQueue } from '@/lib/server/jobs/power/queue';
import { QUEUES } from '@/lib/server/jobs/chunk-queue';
import { EstimateExchange, estimateKeys } from '@/lib/server/jobs/power/estimate-exchange';
import type { ChunkTask } from '@/lib/server/jobs/power/worker';
import { SharedEstimates } from '@/lib/design/power/sharedEstimates';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { freezeQueuedDesign, queueWorkersOfFile, QUEUED_DESIGN, QUEUED_RUN } from '../support/power-queue';
import { startQueueWorker, testRedisUrl, type Child } from '../support/processes';

const content = QUEUED_DESIGN;
const spec = { ...QUEUED_RUN, replications: 240, seed: 7 };
const scenario: PowerScenario = buildScenario({ ...spec, designVersionId: 1 } as never, content);

const workers = queueWorkersOfFile();
let inProcess: Awaited<ReturnType<typeof runScenario>>;

beforeAll(async () => {
  inProcess = await runScenario(scenario, { workers: 1 });
});

/** What a worker's log says of each power chunk's calibration estimates: taken from other workers, estimated itself. */
function estimatesShared(worker: Child): Array<{ taken: number; estimated: number }> {
  return [...worker.output().matchAll(/power chunk \d+ of \S+ done \(calibration estimates: (\d+) taken from other workers, (\d+) estimated here\)/g)].map((m) => ({ taken: Number(m[1]), estimated: Number(m[2]) }));
}

/** How long a test waits for a worker's log line about a chunk the run has already heard of. */
const LOGGED = { timeout: 5_000, interval: 50 };

/** The chunks a worker finished, by its own log. */
function chunksDone(worker: Child): number[] {
  return [...worker.output().matchAll(/power chunk (\d+) of \S+ done/g)].map((m) => Number(m[1]));
}

describe('power runs on the shared queue', () => {
  it('give exactly the tallies of a single in-process run when two worker processes share the chunks', async () => {
    workers.push(...(await Promise.all([startQueueWorker(), startQueueWorker()])));
    const progress: number[] = [];
    const outcome = await runScenariosOnQueue([scenario], { chunkSize: 10, onProgress: (n) => void progress.push(n) });
    expect(outcome![0]).toEqual(inProcess);
    // both processes took chunks, and between them every chunk exactly once (a worker logs a chunk
    // just after storing it, so the run can have heard of the last one before its line is read)
    await expect.poll(() => chunksDone(workers[0]).length + chunksDone(workers[1]).length, LOGGED).toBe(24);
    expect(chunksDone(workers[0]).length).toBeGreaterThan(0);
    expect(chunksDone(workers[1]).length).toBeGreaterThan(0);
    expect([...chunksDone(workers[0]), ...chunksDone(workers[1])].sort((a, b) => a - b)).toEqual(Array.from({ length: 24 }, (_, i) => i));
    expect(progress.at(-1)).toBe(240);
    expect(progress).toEqual([...progress].sort((a, b) => a - b));
    // the two processes shared their calibration estimates (and the tallies above are unchanged by it)
    const shared = [...estimatesShared(workers[0]), ...estimatesShared(workers[1])];
    expect(shared).toHaveLength(24);
    expect(shared.reduce((sum, chunk) => sum + chunk.taken, 0)).toBeGreaterThan(0);
    expect(shared.reduce((sum, chunk) => sum + chunk.estimated, 0)).toBeGreaterThan(0);
    // and the run's lists of them went with the run
    const redis = new Redis(testRedisUrl(), { maxRetriesPerRequest: null });
    try {
      expect(await redis.keys('switchback:run:*:estimates:*')).toEqual([]);
    } finally {
      await redis.quit();
    }
  }, 120_000);

  it('hears of each finished chunk as the worker stores it, not at its next look at the results', async () => {
    workers.push(await startQueueWorker());
    const progress: number[] = [];
    // looks at stop, errors and workers once a minute: a run that waited for its looks would outlast the test
    const outcome = await runScenariosOnQueue([scenario], { chunkSize: 40, pollMs: 60_000, onProgress: (n) => void progress.push(n) });
    expect(outcome![0]).toEqual(inProcess);
    expect(progress.at(-1)).toBe(240);
  }, 30_000);

  it('completes with the same tallies when a worker process is killed mid-chunk: another takes its chunk over', async () => {
    workers.push(...(await Promise.all([startQueueWorker(), startQueueWorker()])));
    const [doomed, survivor] = workers;
    const run = runScenariosOnQueue([scenario], { chunkSize: 20 });
    // killed outright (no chance to finish or give the chunk back) while it holds a chunk
    const started = await doomed.waitFor(/power chunk (\d+) of \S+ started/);
    doomed.process.kill('SIGKILL');
    const outcome = await run;
    expect(outcome![0]).toEqual(inProcess);
    await expect.poll(() => chunksDone(survivor), LOGGED).toContain(Number(started[1]));
    expect(chunksDone(doomed)).not.toContain(Number(started[1]));
  }, 120_000);

  it('cancels on every worker: chunks in hand stop, chunks waiting are dropped', async () => {
    workers.push(...(await Promise.all([startQueueWorker(), startQueueWorker()])));
    let stop = false;
    // 2,000 chunks: cancelled after 40 replicates, so however fast the machine, most are never run
    const big = { ...scenario, replications: 20_000 };
    const outcome = await runScenariosOnQueue([big], { chunkSize: 10, onProgress: (n) => void (n >= 40 && (stop = true)), shouldStop: () => stop });
    expect(outcome).toBeNull();
    const queue = new Queue(QUEUES.power, { connection: new Redis(testRedisUrl(), { maxRetriesPerRequest: null }) });
    try {
      const deadline = Date.now() + 10_000;
      let counts = await queue.getJobCounts('wait', 'active', 'prioritized', 'delayed');
      while (Object.values(counts).some((n) => n > 0) && Date.now() < deadline) {
        await new Promise((resolve) => setTimeout(resolve, 100));
        counts = await queue.getJobCounts('wait', 'active', 'prioritized', 'delayed');
      }
      expect(counts).toEqual({ wait: 0, active: 0, prioritized: 0, delayed: 0 });
      const done = chunksDone(workers[0]).length + chunksDone(workers[1]).length;
      expect(done).toBeLessThan(2000 / 2); // far from all 2,000 chunks: the rest were never run
    } finally {
      await queue.close();
    }
  }, 120_000);

  it('runs a power run started in the app on the queue, with its progress, result and audit as in process', async () => {
    await migrateUp();
    workers.push(...(await Promise.all([startQueueWorker(), startQueueWorker()])));
    const { study, team } = await makeStudyWithTeam('Queued power run');
    const version = await freezeQueuedDesign(study.id, team.owner.id);
    const response = await startRun(await requestAs(team.editor, 'POST', `/api/studies/${study.id}/power-runs`, { json: { ...spec, designVersionId: version.id } }), ctx({ id: String(study.id) }));
    expect(response.status).toBe(202);
    const { run } = await response.json();
    const deadline = Date.now() + 90_000;
    let read = run;
    while (read.status !== 'finished' && Date.now() < deadline) {
      expect(['queued', 'running']).toContain(read.status);
      await new Promise((resolve) => setTimeout(resolve, 200));
      const reply = await getRun(await requestAs(team.viewer, 'GET', `/api/studies/${study.id}/power-runs/${run.id}`), ctx({ id: String(study.id), runId: String(run.id) }));
      read = (await reply.json()).run;
    }
    expect(read.status).toBe('finished');
    expect(read.completed).toBe(240);
    expect(read.result.summary.points.map((p: { rejections: number }) => p.rejections)).toEqual(inProcess!.tally.rejections);
    expect(chunksDone(workers[0]).length + chunksDone(workers[1]).length).toBeGreaterThan(0);
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'power-run.start' } })).toBe(1);
  }, 150_000);

  it('refits participants on two worker processes exactly as one by one, in their order', async () => {
    workers.push(...(await Promise.all([startQueueWorker(), startQueueWorker()])));
    const data = simulateStudy({ design: refitDesign(), truth: refitTruth({ id: 'hyperbolic' }, 10), participants: 60, seed: 12 });
    const options = { model: { id: 'hyperbolic' as const }, choice: { sensitivity: 10 }, confidence: 0.95 };
    const queued = await runRefitsOnQueue(data, options);
    expect(queued).toEqual(data.map((p) => refitParticipant(p, options)));
    const refitChunks = (w: Child) => [...w.output().matchAll(/analysis chunk (\d+) of \S+ done/g)].length;
    await expect.poll(() => refitChunks(workers[0]) + refitChunks(workers[1]), LOGGED).toBe(3); // 60 participants, 25 a chunk
  }, 120_000);
});

type TwoProcesses = { redis: Redis; first: EstimateExchange; second: EstimateExchange; runKey: string; key: string; ofFirst: ChunkTask; ofSecond: ChunkTask };

/** Runs `body` with the exchanges of two worker processes and a chunk of one run for each; the run's list goes afterwards. */
async function withTwoProcesses(name: string, body: (two: TwoProcesses) => Promise<void>): Promise<void> {
  const redis = new Redis(testRedisUrl(), { maxRetriesPerRequest: null });
  const runKey = `${name}-${Date.now()}`;
  const [key] = estimateKeys(runKey, [scenario]);
  const ofFirst: ChunkTask = { key: runKey, index: 0, scenario, from: 0, to: 10 };
  try {
    await body({ redis, first: new EstimateExchange(redis), second: new EstimateExchange(redis), runKey, key, ofFirst, ofSecond: { ...ofFirst, from: 10, to: 20 } });
  } finally {
    await redis.del(key);
    await redis.quit();
  }
}

describe('calibration estimates shared between worker processes', () => {
  it('reach another process through the run\'s list, once each, and never come back to the process that added them', () =>
    withTwoProcesses('exchange-test', async ({ redis, first, second, runKey, key, ofFirst, ofSecond }) => {
      expect(await first.beforeChunk(runKey, ofFirst)).toBe(0);
      expect(ofFirst.estimates).toBeInstanceOf(SharedArrayBuffer);
      // a thread of the first process estimates two response vectors
      const mine = new SharedEstimates(ofFirst.estimates!);
      mine.store(0, 0b1011, 0.0125, false, false);
      mine.store(1, 0b1111, 0.5, true, true);
      expect(await first.afterChunk(runKey, ofFirst)).toBe(2);
      expect(await first.afterChunk(runKey, ofFirst)).toBe(0);
      expect(await redis.llen(key)).toBe(1);
      expect(await redis.ttl(key)).toBeGreaterThan(0);

      expect(await second.beforeChunk(runKey, ofSecond)).toBe(2);
      const theirs = new SharedEstimates(ofSecond.estimates!);
      expect(theirs.rateAt(theirs.find(0, 0b1011))).toBe(0.0125);
      expect([theirs.flaggedAt(theirs.find(1, 0b1111)), theirs.fallbackAt(theirs.find(1, 0b1111))]).toEqual([true, true]);
      expect(await second.afterChunk(runKey, ofSecond)).toBe(0); // taken, not estimated there: not added again
      expect(await second.beforeChunk(runKey, ofSecond)).toBe(0);
      expect(await first.beforeChunk(runKey, ofFirst)).toBe(0);
      // an item that is not an export (someone else's write to the list) is skipped, not fatal to the chunk
      await redis.rpush(key, Buffer.from('not an export'));
      expect(await second.beforeChunk(runKey, ofSecond)).toBe(0);
    }));

  it('travel while the chunks run, so a thread finds another process\'s estimate mid-chunk', () =>
    withTwoProcesses('exchange-running', async ({ first, second, runKey, ofFirst, ofSecond }) => {
      await Promise.all([first.beforeChunk(runKey, ofFirst), second.beforeChunk(runKey, ofSecond)]);
      const stopFirst = first.whileRunning(runKey, ofFirst);
      const stopSecond = second.whileRunning(runKey, ofSecond);
      // the first process's thread estimates a vector while both chunks run
      new SharedEstimates(ofFirst.estimates!).store(0, 0b1011, 0.0125, false, false);
      const theirs = new SharedEstimates(ofSecond.estimates!);
      await expect.poll(() => theirs.find(0, 0b1011), { timeout: 5_000, interval: 10 }).toBeGreaterThanOrEqual(0);
      expect(theirs.rateAt(theirs.find(0, 0b1011))).toBe(0.0125);
      expect(await stopFirst()).toEqual({ taken: 0, added: 1 });
      expect(await stopSecond()).toEqual({ taken: 1, added: 0 });
      expect(await first.afterChunk(runKey, ofFirst)).toBe(0); // nothing left for the chunk's end
    }));

  it('are not kept for a design without re-estimated calibration answers', async () => {
    const redis = new Redis(testRedisUrl(), { maxRetriesPerRequest: null });
    try {
      const task: ChunkTask = { key: 'exchange-test-fixed', index: 0, scenario: { ...scenario, calibration: 'known' }, from: 0, to: 10 };
      expect(await new EstimateExchange(redis).beforeChunk('exchange-test-fixed', task)).toBe(0);
      expect(task.estimates).toBeUndefined();
      expect(estimateKeys('exchange-test-fixed', [task.scenario])).toEqual([]);
    } finally {
      await redis.quit();
    }
  });
});
