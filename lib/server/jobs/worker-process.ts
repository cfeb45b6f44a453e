// `npm run worker`: a process that takes chunks from the shared queues (REDIS_URL) — power-run
// replicates and analysis refits — and runs them on its own pools of worker threads, on this machine
// or any other that reaches the same Redis. It needs no database: each chunk carries its whole task
// (a power chunk its full scenario), and its result goes back to Redis.
//
//   REDIS_URL=redis://host:port npm run worker [-- --threads N] [-- --verbose]
//
// Ctrl-C (or SIGTERM) finishes the chunks in hand and leaves; a worker killed outright has its
// chunks taken over by another once their lock runs out (QUEUE_LOCK_MS).
import { parseArgs } from 'node:util';
import { Worker, type Job } from 'bullmq';
import type { Piscina } from 'piscina';
import { queueEnv } from '@/lib/server/env';
import { closeSharedRedis, sharedRedis } from '@/lib/server/redis';
import { createThreadPool } from './thread-pool';
import { defaultWorkerCount } from './power/run-scenario';
import { encodeResult, QUEUES, RUN_KEYS_TTL_S, runKeys, type QueueJob, type QueuedChunk } from './chunk-queue';
import { EstimateExchange } from './power/estimate-exchange';
import type { ChunkTask } from './power/worker';

const { values: flags } = parseArgs({ options: { threads: { type: 'string' }, verbose: { type: 'boolean', default: false } } });
const log = (message: string) => console.log(`[switchback worker ${process.pid}] ${message}`);

const { redisUrl, lockMs } = queueEnv();
const redis = sharedRedis('queue');
if (!redisUrl || !redis) {
  console.error('[switchback worker] REDIS_URL is not set: a worker takes chunks from the shared Redis (see README, "Several machines").');
  process.exit(2);
}
const threads = flags.threads ? Math.max(1, Math.min(16, Number.parseInt(flags.threads, 10) || 1)) : defaultWorkerCount();

// power chunks share their calibration estimates with the other worker processes of their run
const exchange = new EstimateExchange(redis);

/**
 * The processor of one queue: runs a chunk on `pool` unless its run was cancelled; a cancel
 * mid-chunk stops the thread's task. A power chunk takes the estimates other processes have added
 * to its run before it starts and while it runs, and adds its own while it runs and before its
 * result is stored.
 */
function processorFor(job: QueueJob, pool: Piscina) {
  return async (queued: Job<QueuedChunk<unknown>>): Promise<'done' | 'cancelled'> => {
    const { runKey, chunk, task } = queued.data;
    const keys = runKeys(runKey);
    const power = job === 'power';
    // in one round trip: the run's cancel flag, a result already stored, and the estimates other processes added
    const [cancelled, stored, fromOthers] = await Promise.all([
      redis!.exists(keys.cancel),
      redis!.hexists(keys.results, String(chunk)),
      power ? exchange.beforeChunk(runKey, task as ChunkTask) : 0,
    ]);
    if (cancelled || stored) return 'cancelled';
    let taken = fromOthers;
    if (flags.verbose) log(`${job} chunk ${chunk} of ${runKey} started`);
    const sharing = power ? exchange.whileRunning(runKey, task as ChunkTask) : null;
    let added = 0;
    const abort = new AbortController();
    const watch = setInterval(() => {
      redis!.exists(keys.cancel).then(
        (cancelled) => {
          if (cancelled) abort.abort();
        },
        () => {}, // the next look retries
      );
    }, 250);
    let result: unknown;
    try {
      result = await pool.run(task, { signal: abort.signal });
    } catch (error) {
      if (abort.signal.aborted) return 'cancelled';
      const text = error instanceof Error ? `${error.name}: ${error.message}` : String(error);
      await redis!.set(keys.error, text, 'EX', RUN_KEYS_TTL_S, 'NX');
      throw error;
    } finally {
      clearInterval(watch);
      const during = await sharing?.();
      taken += during?.taken ?? 0;
      added += during?.added ?? 0;
    }
    if (power) added += await exchange.afterChunk(runKey, task as ChunkTask);
    // first write wins: a chunk retried after its worker died is not stored (or counted) twice
    // and the chunk's number is announced to the process waiting for the run
    await redis!
      .multi()
      .hsetnx(keys.results, String(chunk), encodeResult(result))
      .expire(keys.results, RUN_KEYS_TTL_S)
      .rpush(keys.done, String(chunk))
      .expire(keys.done, RUN_KEYS_TTL_S)
      .exec();
    if (flags.verbose) log(`${job} chunk ${chunk} of ${runKey} done` + (power ? ` (calibration estimates: ${taken} taken from other workers, ${added} estimated here)` : ''));
    return 'done';
  };
}

const pools = await Promise.all((['power', 'analysis'] as const).map(async (job) => ({ job, pool: await createThreadPool(job, threads) })));
// every thread loads its job's bundle before the first chunk comes (one call per thread: a thread takes one task at a time)
await Promise.all(pools.flatMap(({ pool }) => Array.from({ length: threads }, () => pool.run(null, { name: 'loaded' }))));
const workers = pools.map(
  ({ job, pool }) =>
    new Worker(QUEUES[job], processorFor(job, pool), {
      connection: redis,
      concurrency: threads,
      lockDuration: lockMs,
      stalledInterval: Math.max(500, Math.round(lockMs / 2)),
      // a chunk whose worker dies is handed on; past this many deaths the chunk fails its run
      maxStalledCount: 5,
    }),
);
for (const worker of workers) {
  worker.on('failed', (queued, error) => log(`${worker.name} chunk ${queued?.data.chunk ?? '?'} failed: ${error.message}`));
  worker.on('error', (error) => log(`queue error: ${error.message}`));
}
await Promise.all(workers.map((w) => w.waitUntilReady()));
log(`taking power chunks and refits from ${redisUrl.replace(/\/\/[^@/]*@/, '//…@')} on ${threads} thread${threads === 1 ? '' : 's'} (lock ${lockMs} ms)`);

let closing = false;
async function close(code: number) {
  if (closing) return;
  closing = true;
  log('finishing the chunks in hand ...');
  await Promise.all(workers.map((w) => w.close()));
  await Promise.all(pools.map(({ pool }) => pool.destroy()));
  await closeSharedRedis();
  process.exit(code);
}
process.on('SIGINT', () => void close(0));
process.on('SIGTERM', () => void close(0));
