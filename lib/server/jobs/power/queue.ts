import { randomUUID } from 'node:crypto';
import { Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import { sharedRedis } from '@/lib/server/redis';
import type { PowerScenario } from '@/lib/design/power/types';
import { mergeChunkResults, splitIntoChunks, type RunScenarioOptions, type ScenariosOutcome } from './run-scenario';
import type { ChunkResult } from './worker';

/** The BullMQ queue power chunks go through; `npm run worker` processes take from it. */
export const POWER_QUEUE = 'switchback-power';

/** What one queued chunk carries: the whole scenario, so every option of it reaches the worker. */
export type ChunkJob = { runKey: string; chunk: number; index: number; scenario: PowerScenario; from: number; to: number };

/**
 * Where a run's chunk results, cancel flag and first error live in Redis. Results are a hash
 * keyed by chunk number and written with HSETNX, so a chunk done twice (its first worker died
 * after computing it) is stored once.
 */
export function runKeys(runKey: string) {
  const base = `switchback:power:${runKey}`;
  return { results: `${base}:results`, cancel: `${base}:cancel`, error: `${base}:error` };
}

/** How long a run's keys outlive it in Redis (a day), so nothing piles up when a web process dies. */
export const RUN_KEYS_TTL_S = 86_400;

const holder = globalThis as unknown as { switchbackPowerChunkQueues?: Map<Redis, Queue> };
const queues = (holder.switchbackPowerChunkQueues ??= new Map());

function powerQueue(connection: Redis): Queue {
  let queue = queues.get(connection);
  if (!queue) {
    queue = new Queue(POWER_QUEUE, { connection });
    queues.set(connection, queue);
  }
  return queue;
}

export type QueueRunOptions = Omit<RunScenarioOptions, 'workers'> & {
  /** names the run in logs and job ids (a fresh key per attempt is added) */
  label?: string;
  /** how often progress is read from Redis (ms), default 250 */
  pollMs?: number;
};

/**
 * Runs scenarios on the shared queue (REDIS_URL): the run is split exactly as in process
 * (splitIntoChunks), every chunk is enqueued with its full scenario, and whichever worker
 * processes take them store each chunk's tally under its chunk number. This process only
 * reads progress, and merges the tallies in chunk order when all are in, so the outcome equals
 * the in-process run's for the same seed, whatever the number and speed of workers. A stop
 * (shouldStop) sets the run's cancel flag, which every worker reads before and during a chunk,
 * and removes the chunks still waiting. A chunk that failed with an error rejects the run.
 */
export async function runScenariosOnQueue(scenarios: readonly PowerScenario[], options: QueueRunOptions = {}): Promise<ScenariosOutcome> {
  const redis = sharedRedis('queue');
  if (!redis) throw new Error('runScenariosOnQueue needs REDIS_URL');
  const queue = powerQueue(redis);
  const chunks = splitIntoChunks(scenarios, options.chunkSize);
  const runKey = `${options.label ?? 'run'}-${randomUUID()}`;
  const keys = runKeys(runKey);
  const sizes = chunks.map((c) => c.to - c.from);
  const jobId = (chunk: number) => `${runKey}-${chunk}`;
  await queue.addBulk(
    chunks.map((c, chunk) => ({
      name: 'chunk',
      data: { runKey, chunk, index: c.index, scenario: scenarios[c.index], from: c.from, to: c.to } satisfies ChunkJob,
      // the tally is kept in the run's hash; the job itself need not stay in Redis once done
      opts: { jobId: jobId(chunk), removeOnComplete: true, removeOnFail: { age: RUN_KEYS_TTL_S } },
    })),
  );
  let reported = -1;
  try {
    for (;;) {
      if (options.shouldStop?.()) {
        await cancelRun(queue, redis, keys.cancel, chunks.map((_, i) => jobId(i)));
        return null;
      }
      const [error, done] = await Promise.all([redis.get(keys.error), redis.hkeys(keys.results)]);
      if (error) {
        await cancelRun(queue, redis, keys.cancel, chunks.map((_, i) => jobId(i)));
        throw new Error(`power worker: ${error}`);
      }
      const completed = done.reduce((sum, field) => sum + (sizes[Number(field)] ?? 0), 0);
      if (completed !== reported) {
        reported = completed;
        await options.onProgress?.(completed);
      }
      if (done.length >= chunks.length) break;
      await new Promise((resolve) => setTimeout(resolve, options.pollMs ?? 250));
    }
    const stored = await redis.hgetall(keys.results);
    const results = chunks.map((_, i) => JSON.parse(stored[String(i)]) as ChunkResult);
    return mergeChunkResults(scenarios.length, chunks, results);
  } finally {
    await redis.del(keys.results, keys.error).catch(() => {});
  }
}

/** Flags the run cancelled for every worker and drops its chunks that no worker holds yet. */
async function cancelRun(queue: Queue, redis: Redis, cancelKey: string, jobIds: string[]): Promise<void> {
  await redis.set(cancelKey, '1', 'EX', RUN_KEYS_TTL_S);
  // a chunk a worker holds is locked and stays (its worker sees the flag); the rest go now
  await Promise.all(jobIds.map((id) => queue.remove(id).catch(() => 0)));
}
