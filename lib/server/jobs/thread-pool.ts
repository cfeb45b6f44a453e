import os from 'node:os';
import { Piscina } from 'piscina';
import { workerFile, type ThreadJob } from './worker-bundle';

// the task function each job's worker.ts exports
const TASKS: Record<ThreadJob, string> = { power: 'runChunk', analysis: 'refitChunk' };

/**
 * A pool of worker threads (piscina) running one of the job tasks under lib/server/jobs: each
 * thread loads the job's worker.ts bundled into plain JavaScript (workerFile), so the threads run
 * the same engine source under next dev, next start, vitest and `npm run worker`.
 */
export async function createThreadPool<Task, Result>(job: ThreadJob, threads: number): Promise<Piscina<Task, Result>> {
  const filename = await workerFile(job);
  // a whole number of threads from the start: a run hands out every chunk at once, and threads
  // that start later would only add start-up time
  // execArgv empty: the bundle is plain JavaScript, so a thread need not inherit a TypeScript
  // loader the parent process was started with (tsx under `npm run worker` and the benchmarks)
  return new Piscina<Task, Result>({ filename, name: TASKS[job], minThreads: threads, maxThreads: threads, idleTimeout: 60_000, concurrentTasksPerWorker: 1, execArgv: [] });
}

/** Threads by default: the setting if given, else the machine's available parallelism (at most 8). */
export function threadCount(configured: number | undefined): number {
  if (configured !== undefined) return configured;
  return Math.max(1, Math.min(8, os.availableParallelism()));
}

/** The message of an error thrown in a thread (piscina passes it through), with the job's name before it. */
export function threadError(job: string, error: unknown): Error {
  const text = error instanceof Error ? `${error.name}: ${error.message}` : String(error);
  return new Error(`${job} worker: ${text}`, { cause: error });
}
