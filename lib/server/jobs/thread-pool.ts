import os from 'node:os';
import path from 'node:path';
import { Piscina } from 'piscina';

/**
 * A pool of worker threads (piscina) running one of the job entries under lib/server/jobs: a plain
 * .mjs file that registers tsx in its thread and re-exports the TypeScript task function, so the
 * threads run the same engine source under next dev, next start, vitest and `npm run worker`.
 * The entry's path is joined at run time from the project root so no bundler follows it into tsx.
 */
export function createThreadPool<Task, Result>(job: 'power' | 'analysis', threads: number): Piscina<Task, Result> {
  const filename = [process.cwd(), 'lib', 'server', 'jobs', job, 'worker-bootstrap.mjs'].join(path.sep);
  // a whole number of threads from the start: a run hands out every chunk at once, and threads
  // that start later would only add start-up time
  return new Piscina<Task, Result>({ filename, minThreads: threads, maxThreads: threads, idleTimeout: 60_000, concurrentTasksPerWorker: 1 });
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
