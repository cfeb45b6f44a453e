import { deserialize, serialize } from 'node:v8';
import { Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import { sharedRedis } from '@/lib/server/redis';

/** The BullMQ queues of the jobs; `npm run worker` processes take from every one of them. */
export const QUEUES = { power: 'switchback-power', analysis: 'switchback-refits' } as const;
export type QueueJob = keyof typeof QUEUES;

/** What one queued chunk carries: its run, its number in the run, and the whole task of its thread. */
export type QueuedChunk<Task> = { runKey: string; chunk: number; task: Task };

/**
 * Where a run's chunk results, cancel flag and first error live in Redis. Results are a hash
 * keyed by chunk number and written with HSETNX, so a chunk done twice (its first worker died
 * after computing it) is stored once; with each result its chunk number goes on the run's `done`
 * list, on which the process that started the run waits. A power run's calibration estimates,
 * which its worker processes share, are a list per design (power/estimate-exchange.ts).
 */
export function runKeys(runKey: string) {
  const base = `switchback:run:${runKey}`;
  return {
    results: `${base}:results`,
    done: `${base}:done`,
    cancel: `${base}:cancel`,
    error: `${base}:error`,
    estimates: (design: string) => `${base}:estimates:${design}`,
  };
}

/**
 * A chunk's result as stored in Redis: Node's structured-clone serialisation (what the thread pool
 * passes results through), base64, so NaN, ±Infinity and -0 come back exactly as computed, not as
 * JSON's null.
 */
export function encodeResult(result: unknown): string {
  return serialize(result).toString('base64');
}

/** Reads a stored chunk result back (encodeResult). */
export function decodeResult<Result>(text: string): Result {
  return deserialize(Buffer.from(text, 'base64')) as Result;
}

/** How long a run's keys outlive it in Redis (a day), so nothing piles up when a web process dies. */
export const RUN_KEYS_TTL_S = 86_400;

const holder = globalThis as unknown as { switchbackChunkQueues?: Map<string, Queue> };
const queues = (holder.switchbackChunkQueues ??= new Map());

function queueOf(job: QueueJob, connection: Redis): Queue {
  const id = `${job} ${connection.options.host}:${connection.options.port}/${connection.options.db ?? 0}`;
  let queue = queues.get(id);
  if (!queue) {
    queue = new Queue(QUEUES[job], { connection });
    queues.set(id, queue);
  }
  return queue;
}

/** How many worker processes listen on the queue of `job` now (0 without REDIS_URL). */
export async function queueWorkerCount(job: QueueJob): Promise<number> {
  const redis = sharedRedis('queue');
  return redis ? queueOf(job, redis).getWorkersCount() : 0;
}

export type ChunkQueueOptions = {
  /** checked between looks at the results; true cancels the run everywhere (the result is then null) */
  shouldStop?: () => boolean;
  /** called whenever more chunks are done, with the numbers of the chunks done so far */
  onChunksDone?: (done: number[]) => void | Promise<void>;
  /** the longest wait for a finished chunk before the stop, errors and workers are looked at again (ms), default 250 */
  pollMs?: number;
  /**
   * called with true when chunks remain and no worker process listens on the queue, and with
   * false when one listens again (looked at every `workerCheckMs`, default 2000)
   */
  onWorkerless?: (workerless: boolean) => void | Promise<void>;
  workerCheckMs?: number;
  /** further Redis keys of the run, removed with its results when it ends (a power run's shared estimates) */
  runData?: string[];
};

/**
 * Puts a run's tasks on the shared queue of `job` (REDIS_URL) as chunks numbered in order and
 * waits, without computing anything, until worker processes have stored a result for every
 * chunk; returns the results in chunk order. A stop sets the run's cancel flag, which every
 * worker reads before and during a chunk, and removes the chunks still waiting. A chunk that
 * failed with an error rejects the run (and cancels the rest).
 */
export async function runChunksOnQueue<Task, Result>(job: QueueJob, runKey: string, tasks: readonly Task[], options: ChunkQueueOptions = {}): Promise<Result[] | null> {
  const redis = sharedRedis('queue');
  if (!redis) throw new Error('the shared queue needs REDIS_URL');
  const queue = queueOf(job, redis);
  const keys = runKeys(runKey);
  const jobIds = tasks.map((_, chunk) => `${runKey}-${chunk}`);
  await queue.addBulk(
    tasks.map((task, chunk) => ({
      name: job,
      data: { runKey, chunk, task } satisfies QueuedChunk<Task>,
      // the result is kept in the run's hash; the job itself need not stay in Redis once done
      opts: { jobId: jobIds[chunk], removeOnComplete: true, removeOnFail: { age: RUN_KEYS_TTL_S } },
    })),
  );
  const cancel = async () => {
    await redis.set(keys.cancel, '1', 'EX', RUN_KEYS_TTL_S);
    // a chunk a worker holds is locked and stays (its worker sees the flag); the rest go now
    await Promise.all(jobIds.map((id) => queue.remove(id).catch(() => 0)));
  };
  let reported = -1;
  let workerless = false;
  let lastWorkerCheck = Date.now();
  const done = new Set<number>();
  // a connection of its own for the blocking wait on the run's list of finished chunks
  const waiter = redis.duplicate();
  try {
    for (;;) {
      if (options.shouldStop?.()) {
        await cancel();
        return null;
      }
      const [error, stored] = await Promise.all([redis.get(keys.error), redis.hlen(keys.results)]);
      if (error) {
        await cancel();
        throw new Error(`${job} worker: ${error}`);
      }
      // the hash is read whole only when it holds results whose chunks were not announced
      if (stored > done.size) for (const field of await redis.hkeys(keys.results)) done.add(Number(field));
      if (done.size !== reported) {
        reported = done.size;
        await options.onChunksDone?.([...done].sort((a, b) => a - b));
      }
      if (done.size >= tasks.length) break;
      if (options.onWorkerless && Date.now() - lastWorkerCheck >= (options.workerCheckMs ?? 2000)) {
        lastWorkerCheck = Date.now();
        const none = (await queue.getWorkersCount()) === 0;
        if (none !== workerless) {
          workerless = none;
          await options.onWorkerless(none);
        }
      }
      // until a worker announces a finished chunk, or pollMs at most; then every announcement so far
      const first = await waiter.blpop(keys.done, (options.pollMs ?? 250) / 1000);
      if (first) {
        done.add(Number(first[1]));
        const [[, rest]] = (await redis.multi().lrange(keys.done, 0, -1).del(keys.done).exec()) as [[Error | null, string[]], unknown];
        for (const chunk of rest) done.add(Number(chunk));
      }
    }
    const stored = await redis.hgetall(keys.results);
    return tasks.map((_, chunk) => decodeResult<Result>(stored[String(chunk)]));
  } finally {
    waiter.disconnect();
    await redis.del(keys.results, keys.error, keys.done, ...(options.runData ?? [])).catch(() => {});
  }
}
