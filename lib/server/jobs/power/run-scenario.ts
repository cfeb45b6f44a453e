import { randomUUID } from 'node:crypto';
import { setMaxListeners } from 'node:events';
import { sharedEstimateBuffer } from '@/lib/design/power/sharedEstimates';
import { mergeTallies } from '@/lib/design/power/tally';
import { powerEnv } from '@/lib/server/env';
import { createThreadPool, threadCount, threadError } from '../thread-pool';
import type { PowerScenario, PowerTally } from '@/lib/design/power/types';
import type { ChunkResult, ChunkTask } from './worker';

export type RunScenarioOptions = {
  /** worker threads; default POWER_WORKERS or the machine's available parallelism, at most 8 */
  workers?: number;
  /** replicates per chunk; default about 40 chunks per scenario, 10 to 250 replicates each */
  chunkSize?: number;
  /** called after every finished chunk with the replicates done so far */
  onProgress?: (completed: number) => void | Promise<void>;
  /** checked before every chunk and after each; true stops the run (the result is then null) */
  shouldStop?: () => boolean;
};

export type ScenarioOutcome = { tally: PowerTally; longestCalibrationDelay: number | null } | null;

/** Per scenario of a run (the assumed truth first, then each stress truth): its merged tally. */
export type ScenariosOutcome = Array<{ tally: PowerTally; longestCalibrationDelay: number | null }> | null;

/** One chunk of a run: replicates [from, to) of scenario `index`. */
export type Chunk = { index: number; from: number; to: number };

/** Default worker count: POWER_WORKERS if set, else os.availableParallelism() (at most 8). */
export function defaultWorkerCount(): number {
  return threadCount(powerEnv().POWER_WORKERS);
}

/** Replicates at the end of a run that go in quarter-size chunks: four chunks' worth. */
const TAIL_CHUNKS = 4;

/**
 * The chunks of a run, scenario by scenario, in replicate order. The same split serves the
 * in-process pool and the queue, so both merge the same pieces. Without `chunkSize`, a run's last
 * TAIL_CHUNKS chunks' worth of replicates go in chunks a quarter of the size: threads and workers
 * that finish early wait for a small last chunk rather than a whole one.
 */
export function splitIntoChunks(scenarios: readonly PowerScenario[], chunkSize?: number): Chunk[] {
  const chunks: Chunk[] = [];
  scenarios.forEach((scenario, index) => {
    const total = scenario.replications;
    const size = chunkSize ?? Math.min(250, Math.max(10, Math.ceil(total / 40)));
    const tail = chunkSize === undefined && index === scenarios.length - 1 ? Math.max(0, total - TAIL_CHUNKS * size) : total;
    for (let from = 0; from < total; ) {
      const to = from < tail ? Math.min(tail, from + size) : Math.min(total, from + Math.ceil(size / 4));
      chunks.push({ index, from, to });
      from = to;
    }
  });
  return chunks;
}

/**
 * Merges the chunk results of a run (given in chunk order) into one outcome per scenario. Tallies
 * are whole-number counts, so the merge is exact: the same for any number and speed of workers.
 */
export function mergeChunkResults(scenarioCount: number, chunks: readonly Chunk[], results: readonly ChunkResult[]): NonNullable<ScenariosOutcome> {
  const tallies: PowerTally[][] = Array.from({ length: scenarioCount }, () => []);
  const longest: Array<number | null> = Array.from({ length: scenarioCount }, () => null);
  chunks.forEach((chunk, i) => {
    tallies[chunk.index].push(results[i].tally);
    longest[chunk.index] = results[i].longestCalibrationDelay; // a property of the scenario: every chunk reports the same
  });
  return tallies.map((parts, index) => ({ tally: mergeTallies(parts), longestCalibrationDelay: longest[index] }));
}

/**
 * Runs a scenario's replicates in chunks on a pool of worker threads and merges the chunk
 * tallies (see runScenarios).
 */
export async function runScenario(scenario: PowerScenario, options: RunScenarioOptions = {}): Promise<ScenarioOutcome> {
  const outcome = await runScenarios([scenario], options);
  return outcome ? outcome[0] : null;
}

/**
 * Runs several scenarios of one run (the assumed truth and its stress truths) on one pool of
 * worker threads (piscina), chunk by chunk, so the threads start once; progress counts the
 * replicates of every scenario. Chunks are handed out as threads free up and merged in chunk
 * order. A thrown error in a thread rejects; shouldStop() (looked at after every chunk and every
 * 100 ms) ends the run early, stopping the chunks in hand (null).
 */
export async function runScenarios(scenarios: readonly PowerScenario[], options: RunScenarioOptions = {}): Promise<ScenariosOutcome> {
  const chunks = splitIntoChunks(scenarios, options.chunkSize);
  if (options.shouldStop?.()) return null;
  const threads = Math.max(1, Math.min(options.workers ?? defaultWorkerCount(), chunks.length));
  const pool = await createThreadPool<ChunkTask, ChunkResult>('power', threads);
  const key = randomUUID();
  const abort = new AbortController();
  setMaxListeners(chunks.length + 10, abort.signal); // every waiting chunk listens for the stop
  const estimates = sharedEstimateBuffers(scenarios);
  const results: ChunkResult[] = new Array(chunks.length);
  let completed = 0;
  let stopped = false;
  // a stop is looked for between chunks and on a timer, so a cancel ends even a long chunk at once
  const stop = () => {
    stopped = true;
    abort.abort(); // the chunks still waiting or running are dropped
  };
  const watch = setInterval(() => {
    if (!stopped && options.shouldStop?.()) stop();
  }, 100);
  try {
    await Promise.all(
      chunks.map(async ({ index, from, to }, i) => {
        let result: ChunkResult;
        try {
          result = await pool.run({ key, index, scenario: scenarios[index], from, to, estimates: estimates[index] }, { signal: abort.signal });
        } catch (error) {
          if (stopped) return;
          throw threadError('power', error);
        }
        results[i] = result;
        completed += to - from;
        if (stopped) return;
        if (options.shouldStop?.()) return stop();
        await options.onProgress?.(completed);
      }),
    );
  } finally {
    clearInterval(watch);
    abort.abort();
    await pool.destroy();
  }
  if (stopped || options.shouldStop?.()) return null;
  return mergeChunkResults(scenarios.length, chunks, results);
}

/**
 * Per scenario, the shared-estimate buffer its threads use (one per distinct design of the run, so
 * the assumed truth and its stress truths share one), for a simulated calibration block of a
 * personalised design. With one thread too: the table is then that thread's memo of estimates,
 * which it reads faster than a Map of them.
 */
function sharedEstimateBuffers(scenarios: readonly PowerScenario[]): Array<SharedArrayBuffer | undefined> {
  const byDesign = new Map<string, SharedArrayBuffer>();
  return scenarios.map((scenario) => {
    if (!sharesEstimates(scenario)) return undefined;
    const key = JSON.stringify(scenario.design);
    let buffer = byDesign.get(key);
    if (!buffer) byDesign.set(key, (buffer = sharedEstimateBuffer()));
    return buffer;
  });
}

/**
 * Whether a scenario's threads can share calibration estimates: a simulated calibration block of a
 * personalised design, where each participant's answers are re-estimated.
 */
export function sharesEstimates(scenario: PowerScenario): boolean {
  return scenario.calibration === 'simulated' && scenario.design.spec.mode === 'personalised';
}
