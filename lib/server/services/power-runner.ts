import { Op } from 'sequelize';
import { db } from '@/db';
import { DesignVersion, PowerRun } from '@/db/models';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import type { PowerRunSpec } from '@/lib/shared/validations/power';
import { notifyPowerRunFinished } from './notices';
import { buildScenarios, runResult } from '@/lib/shared/power-scenario';
import { powerRunLimits, queueEnv } from '@/lib/server/env';
import { runScenarios } from '@/lib/server/jobs/power/run-scenario';
import { runScenariosOnQueue } from '@/lib/server/jobs/power/queue';
import { queueWorkerCount } from '@/lib/server/jobs/chunk-queue';
import { RAN_IN_PROCESS_MESSAGE, WAITING_FOR_WORKER_MESSAGE } from '@/lib/shared/power-queue';
import { decodeJson } from '@/db/json';

type RunState = { cancel: boolean; studyId: number };
type Waiting = { runId: number; studyId: number; workers?: number; done: () => void };

/** Runs executing in this process, with their cancel flags (on globalThis to survive dev reloads). */
const holder = globalThis as unknown as { switchbackPowerRuns?: Map<number, RunState>; switchbackPowerQueue?: Waiting[] };
export const activeRuns = (holder.switchbackPowerRuns ??= new Map());
/** Runs saved as queued and waiting here for a free slot, oldest first. */
const waiting = (holder.switchbackPowerQueue ??= []);

/** How often a running run's heartbeat is written; a run silent for STALE_MS is taken as interrupted. */
export const HEARTBEAT_MS = 2000;
export const STALE_MS = 20_000;


/** Asks this process to stop a run before its next chunk, or drops it from the queue. */
export function requestCancel(runId: number): void {
  const state = activeRuns.get(runId);
  if (state) state.cancel = true;
  const index = waiting.findIndex((w) => w.runId === runId);
  if (index >= 0) waiting.splice(index, 1)[0]!.done();
}

/**
 * Where each run waiting in this process stands: 1 for the next to start. A run that is queued
 * but not listed here is about to be claimed (or belongs to another process).
 */
export function queuePositions(): Map<number, number> {
  return new Map(waiting.map((w, i) => [w.runId, i + 1]));
}

/** Whether a run is executing or waiting in this process. */
export function isHeldHere(runId: number): boolean {
  return activeRuns.has(runId) || waiting.some((w) => w.runId === runId);
}

let queueBeat: ReturnType<typeof setInterval> | null = null;

/**
 * Starts the waiting runs that fit under the caps (powerRunLimits: per server process and per
 * study), oldest first; a run of a study already at its cap lets later runs of other studies pass.
 * Waiting runs keep a heartbeat, so no reader takes them for interrupted.
 */
function pump(): void {
  const { perServer, perStudy } = powerRunLimits();
  for (let i = 0; i < waiting.length && activeRuns.size < perServer; ) {
    const next = waiting[i]!;
    const ofStudy = [...activeRuns.values()].filter((r) => r.studyId === next.studyId).length;
    if (ofStudy >= perStudy) {
      i += 1;
      continue;
    }
    waiting.splice(i, 1);
    const state: RunState = { cancel: false, studyId: next.studyId };
    activeRuns.set(next.runId, state);
    execute(next.runId, state, { workers: next.workers })
      .catch((error) => console.error(`[switchback] power run ${next.runId} could not record its outcome:`, error))
      .finally(() => {
        activeRuns.delete(next.runId);
        next.done();
        pump();
      });
  }
  if (waiting.length > 0 && !queueBeat) {
    queueBeat = setInterval(() => {
      const ids = waiting.map((w) => w.runId);
      if (ids.length === 0) return;
      PowerRun.update({ heartbeatAt: new Date() }, { where: { id: ids, status: 'queued' } }).catch((error) =>
        console.warn(`[switchback] queued power runs: heartbeat not written (${error instanceof Error ? error.message : error})`),
      );
    }, HEARTBEAT_MS);
    queueBeat.unref?.();
  } else if (waiting.length === 0 && queueBeat) {
    clearInterval(queueBeat);
    queueBeat = null;
  }
}

/**
 * Queues a saved run in this process and starts it as soon as a slot is free (see pump): the
 * caller does not await it. Progress, heartbeat and the result go to MariaDB; a cancel (here or
 * from another process, seen as a status change) stops it before the next chunk. The promise
 * settles when the run has ended (or left the queue).
 */
export function launchRun(runId: number, options: { workers?: number; studyId?: number } = {}): Promise<void> {
  if (isHeldHere(runId)) return Promise.resolve();
  return new Promise<void>((resolve) => {
    const enqueue = (studyId: number) => {
      if (isHeldHere(runId)) return resolve();
      waiting.push({ runId, studyId, workers: options.workers, done: resolve });
      pump();
    };
    if (options.studyId !== undefined) return enqueue(options.studyId);
    db();
    PowerRun.findByPk(runId, { attributes: ['id', 'studyId'] })
      .then((row) => (row ? enqueue(row.studyId) : resolve()))
      .catch((error) => {
        console.error(`[switchback] power run ${runId} could not be queued:`, error);
        resolve();
      });
  });
}

async function execute(runId: number, state: { cancel: boolean }, options: { workers?: number }) {
  db();
  const run = await PowerRun.findByPk(runId);
  if (!run) return;
  const version = await DesignVersion.findByPk(run.designVersionId);
  if (!version) return void (await fail(runId, 'The frozen design version of this run no longer exists.'));
  const now = new Date();
  const [claimed] = await PowerRun.update(
    { status: 'running', startedAt: now, heartbeatAt: now, completed: 0, message: null, tally: null, result: null, finishedAt: null },
    { where: { id: runId, status: 'queued' } },
  );
  if (claimed === 0) return; // cancelled before it started, or taken by another process
  // MariaDB counts only changed rows as affected (a heartbeat within the same second changes
  // nothing), so a cancel from elsewhere is read from the status, not from an update's count
  const beat = setInterval(() => {
    PowerRun.update({ heartbeatAt: new Date() }, { where: { id: runId, status: 'running' } })
      .then(() => PowerRun.findByPk(runId, { attributes: ['status'] }))
      .then((row) => {
        if (!row || row.status !== 'running') state.cancel = true;
      })
      .catch((error) => console.warn(`[switchback] power run ${runId}: heartbeat not written (${error instanceof Error ? error.message : error})`)); // the next beat retries
  }, HEARTBEAT_MS);
  try {
    const spec = decodeJson<PowerRunSpec>(run.spec);
    const content = decodeJson<FrozenDesign>(version.content);
    const scenarios = buildScenarios(spec, content);
    const total = scenarios.reduce((sum, s) => sum + s.replications, 0);
    let lastWrite = 0;
    // With REDIS_URL and at least one `npm run worker` listening, the chunks go to the shared queue
    // and this process only reads progress; otherwise they run on this process's threads (as an
    // analysis's refits do), and with REDIS_URL the run says why. Workers that all leave mid-run:
    // the run says it waits for one (WAITING_FOR_WORKER_MESSAGE) until one listens again.
    const withRedis = queueEnv().redisUrl !== null;
    const onQueue = withRedis && (await queueWorkerCount('power')) > 0;
    if (withRedis && !onQueue) {
      console.warn(`[switchback] power run ${runId}: no queue worker is listening; computing it in this process (start \`npm run worker\` to use the queue)`);
      await PowerRun.update({ message: RAN_IN_PROCESS_MESSAGE }, { where: { id: runId, status: 'running' } });
    }
    const setMessage = (message: string | null) =>
      PowerRun.update({ message }, { where: { id: runId, status: 'running' } }).catch((error) =>
        console.warn(`[switchback] power run ${runId}: message not written (${error instanceof Error ? error.message : error})`),
      );
    const engine = onQueue ? runScenariosOnQueue : runScenarios;
    const outcomes = await engine(scenarios, {
      ...(onQueue
        ? {
            label: `run${runId}`,
            onWorkerless: async (workerless: boolean) => {
              if (workerless) console.warn(`[switchback] power run ${runId}: waiting for a queue worker (none is listening); start \`npm run worker\``);
              await setMessage(workerless ? WAITING_FOR_WORKER_MESSAGE : null);
            },
          }
        : { workers: options.workers }),
      shouldStop: () => state.cancel,
      onProgress: async (completed) => {
        const t = Date.now();
        if (t - lastWrite < 250 && completed < total) return;
        lastWrite = t;
        await PowerRun.update({ completed, heartbeatAt: new Date() }, { where: { id: runId, status: 'running' } }).catch((error) =>
          console.warn(`[switchback] power run ${runId}: progress not written (${error instanceof Error ? error.message : error})`),
        );
      },
    });
    if (!outcomes) return; // cancelled: the cancel already wrote the status
    const result: object = runResult(scenarios, outcomes, { number: version.number, hash: version.hash, content }, spec.stress ?? []);
    const [stored] = await PowerRun.update(
      {
        status: 'finished',
        completed: total,
        // a finished queued run waits for nothing, whether or not the worker watch saw a worker return
        ...(onQueue ? { message: null } : {}),
        // the assumed truth's tally (the stress truths' summaries are in the result)
        tally: outcomes[0].tally,
        result,
        finishedAt: new Date(),
        heartbeatAt: new Date(),
      },
      { where: { id: runId, status: 'running' } },
    );
    if (stored > 0) await notifyPowerRunFinished(run.studyId, runId); // never rejects
  } catch (error) {
    const reference = `${Date.now().toString(36)}`;
    console.error(`[switchback] power run ${runId} failed (${reference}):`, error);
    const detail = error instanceof Error && /DesignInputError|must be|expected/.test(`${error.name} ${error.message}`) ? ` ${error.message}` : '';
    await fail(runId, `The simulation stopped with an error (reference ${reference}).${detail}`);
  } finally {
    clearInterval(beat);
  }
}

async function fail(runId: number, message: string) {
  await PowerRun.update({ status: 'failed', message, finishedAt: new Date() }, { where: { id: runId, status: { [Op.in]: ['queued', 'running'] } } });
}

/** The message an interrupted run shows. */
export function interruptedMessage(completed: number, total: number): string {
  return (
    `The server stopped while this run was in progress (${completed} of ${total} replicates done), so it was interrupted. ` +
    'Restart it to run it again from the start; with the same seed it gives the same result.'
  );
}

/**
 * Marks runs that are queued or running but not executing in this process, and silent for
 * longer than `staleMs`, as interrupted. Called at server start (instrumentation.ts) and
 * when a run is read, so a run whose server died never shows progress forever.
 *
 * @returns the number of runs marked
 */
export async function markInterruptedRuns(staleMs = STALE_MS, where: { id?: number; studyId?: number } = {}): Promise<number> {
  db();
  const cutoff = new Date(Date.now() - staleMs);
  const rows = await PowerRun.findAll({
    where: {
      ...where,
      status: { [Op.in]: ['queued', 'running'] },
      [Op.or]: [{ heartbeatAt: null }, { heartbeatAt: { [Op.lt]: cutoff } }],
    },
  });
  let marked = 0;
  for (const row of rows) {
    if (isHeldHere(row.id)) continue;
    const [affected] = await PowerRun.update(
      { status: 'interrupted', message: interruptedMessage(row.completed, row.total) },
      { where: { id: row.id, status: { [Op.in]: ['queued', 'running'] } } },
    );
    marked += affected;
  }
  return marked;
}
