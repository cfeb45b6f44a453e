import { randomUUID } from 'node:crypto';
import type { PowerScenario } from '@/lib/design/power/types';
import { runChunksOnQueue } from '../chunk-queue';
import { estimateKeys } from './estimate-exchange';
import { mergeChunkResults, splitIntoChunks, type RunScenarioOptions, type ScenariosOutcome } from './run-scenario';
import type { ChunkResult, ChunkTask } from './worker';

export type QueueRunOptions = Omit<RunScenarioOptions, 'workers'> & {
  /** names the run in logs and job ids (a fresh key per attempt is added) */
  label?: string;
  /** the longest wait for a finished chunk before a stop and errors are looked at again (ms), default 250: progress itself arrives as chunks finish */
  pollMs?: number;
  /** told when no worker process listens while chunks remain (true) and when one does again (false) */
  onWorkerless?: (workerless: boolean) => void | Promise<void>;
  /** how often the listening workers are counted (ms), default 2000 */
  workerCheckMs?: number;
};

/**
 * Runs scenarios on the shared queue (REDIS_URL): the run is split exactly as in process
 * (splitIntoChunks), every chunk is enqueued with its full scenario (so every option of a
 * scenario reaches the workers), and whichever worker processes take them store each chunk's
 * tally under its chunk number. This process only reads progress, and merges the tallies in
 * chunk order when all are in, so the outcome equals the in-process run's for the same seed,
 * whatever the number and speed of workers. The workers share their calibration estimates through
 * the run's lists (EstimateExchange), which go with its results when the run ends. A stop cancels
 * the run on every worker (null).
 */
export async function runScenariosOnQueue(scenarios: readonly PowerScenario[], options: QueueRunOptions = {}): Promise<ScenariosOutcome> {
  const chunks = splitIntoChunks(scenarios, options.chunkSize);
  const runKey = `${options.label ?? 'run'}-${randomUUID()}`;
  // the run key also names the run's simulators in each worker thread (their caches grow across chunks)
  const tasks: ChunkTask[] = chunks.map((c) => ({ key: runKey, index: c.index, scenario: scenarios[c.index], from: c.from, to: c.to }));
  const results = await runChunksOnQueue<ChunkTask, ChunkResult>('power', runKey, tasks, {
    shouldStop: options.shouldStop,
    pollMs: options.pollMs,
    onWorkerless: options.onWorkerless,
    workerCheckMs: options.workerCheckMs,
    runData: estimateKeys(runKey, scenarios),
    onChunksDone: (done) => options.onProgress?.(done.reduce((sum, chunk) => sum + (chunks[chunk].to - chunks[chunk].from), 0)),
  });
  return results ? mergeChunkResults(scenarios.length, chunks, results) : null;
}
