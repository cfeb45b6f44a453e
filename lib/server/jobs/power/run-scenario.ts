import os from 'node:os';
import path from 'node:path';
import * as threads from 'node:worker_threads';
import type { Worker } from 'node:worker_threads';
import { mergeTallies } from '@/lib/design/power/tally';
import { powerEnv } from '@/lib/server/env';
import { workerMessage } from '../worker-message';
import type { PowerScenario, PowerTally } from '@/lib/design/power/types';

export type RunScenarioOptions = {
  /** worker threads; default POWER_WORKERS or the machine's available parallelism, at most 8 */
  workers?: number;
  /** replicates per chunk; default about 40 chunks per run, 10 to 250 replicates each */
  chunkSize?: number;
  /** called after every finished chunk with the replicates done so far */
  onProgress?: (completed: number) => void | Promise<void>;
  /** checked before every chunk; true stops the run (the result is then null) */
  shouldStop?: () => boolean;
};

export type ScenarioOutcome = { tally: PowerTally; longestCalibrationDelay: number | null } | null;

/** Per scenario of a run (the assumed truth first, then each stress truth): its merged tally. */
export type ScenariosOutcome = Array<{ tally: PowerTally; longestCalibrationDelay: number | null }> | null;

/** Default worker count: POWER_WORKERS if set, else os.availableParallelism() (at most 8). */
export function defaultWorkerCount(): number {
  const configured = powerEnv().POWER_WORKERS;
  if (configured !== undefined) return configured;
  return Math.max(1, Math.min(8, os.availableParallelism()));
}

/**
 * The worker entry, resolved from the project root at run time (so no bundler has to trace
 * it): a plain .mjs file that registers tsx in its thread and imports the TypeScript worker.
 */
export function workerEntry(): string {
  // joined at run time so the bundler does not follow the worker into tsx and esbuild
  const parts = [process.cwd(), 'lib', 'server', 'jobs', 'power', 'worker-bootstrap.mjs'];
  return parts.join(path.sep);
}

/** The Worker constructor, taken at run time for the same reason. */
const WorkerThread: typeof Worker = Reflect.get(threads, 'Worker');

/**
 * Runs a scenario's replicates in chunks on worker threads (node:worker_threads, each loading
 * the engine source through tsx) and merges the chunk tallies. Chunks are handed out as workers free
 * up; tallies are whole-number counts, so the merged result is the same for any number of
 * workers. A thrown error in a worker rejects; shouldStop() ends the run early (null).
 */
export async function runScenario(scenario: PowerScenario, options: RunScenarioOptions = {}): Promise<ScenarioOutcome> {
  const outcome = await runScenarios([scenario], options);
  return outcome ? outcome[0] : null;
}

/**
 * Runs several scenarios of one run (the assumed truth and its stress truths) on one pool of
 * worker threads, chunk by chunk, so the threads start once; progress counts the replicates of
 * every scenario. Each scenario's tally is merged on its own.
 */
export async function runScenarios(scenarios: readonly PowerScenario[], options: RunScenarioOptions = {}): Promise<ScenariosOutcome> {
  const chunks: Array<{ index: number; from: number; to: number }> = [];
  scenarios.forEach((scenario, index) => {
    const total = scenario.replications;
    const chunkSize = options.chunkSize ?? Math.min(250, Math.max(10, Math.ceil(total / 40)));
    for (let from = 0; from < total; from += chunkSize) chunks.push({ index, from, to: Math.min(total, from + chunkSize) });
  });
  const count = Math.max(1, Math.min(options.workers ?? defaultWorkerCount(), chunks.length));
  const key = `${Date.now()}-${Math.random()}`;
  const workers = Array.from({ length: count }, () => new WorkerThread(workerEntry()));
  const tallies: PowerTally[][] = scenarios.map(() => []);
  const longest: Array<number | null> = scenarios.map(() => null);
  let completed = 0;
  let next = 0;
  let stopped = false;
  let requestId = 0;
  try {
    await Promise.all(workers.map(ready));
    await Promise.all(
      workers.map(async (worker) => {
        while (!stopped && next < chunks.length) {
          if (options.shouldStop?.()) {
            stopped = true;
            break;
          }
          const { index, from, to } = chunks[next++];
          const reply = await ask(worker, { id: ++requestId, key, index, scenario: scenarios[index], from, to });
          tallies[index].push(reply.tally);
          longest[index] = reply.longestCalibrationDelay;
          completed += to - from;
          await options.onProgress?.(completed);
        }
      }),
    );
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
  if (stopped || options.shouldStop?.()) return null;
  return tallies.map((parts, index) => ({ tally: mergeTallies(parts), longestCalibrationDelay: longest[index] }));
}

/** Resolves when a worker has loaded the engine and listens; rejects if it fails to start. */
async function ready(worker: Worker): Promise<void> {
  await workerMessage<{ ready?: boolean }>(worker, (message) => message?.ready === true, 'power worker (while starting)');
}

type Reply = { id: number; tally: PowerTally; longestCalibrationDelay: number | null; error?: undefined } | { id: number; error: string };

async function ask(worker: Worker, request: { id: number; key: string; index: number; scenario: PowerScenario; from: number; to: number }) {
  const reply = workerMessage<Reply>(worker, (message) => message.id === request.id, 'power worker');
  worker.postMessage(request);
  const answer = await reply;
  if (answer.error !== undefined) throw new Error(`power worker: ${answer.error}`);
  return { tally: answer.tally, longestCalibrationDelay: answer.longestCalibrationDelay };
}
