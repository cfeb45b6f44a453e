import os from 'node:os';
import path from 'node:path';
import * as threads from 'node:worker_threads';
import type { Worker } from 'node:worker_threads';
import type { ParticipantData, ParticipantRefit, RefitOptions } from '@/lib/design';
import { powerEnv } from '@/lib/server/env';
import { workerMessage } from '../worker-message';

/** Default worker count: ANALYSIS_WORKERS if set, else the machine's available parallelism (at most 8). */
export function defaultRefitWorkers(): number {
  const configured = powerEnv().ANALYSIS_WORKERS;
  if (configured !== undefined) return configured;
  return Math.max(1, Math.min(8, os.availableParallelism()));
}

/** The worker entry, joined at run time from the project root so no bundler follows it into tsx. */
function workerEntry(): string {
  return [process.cwd(), 'lib', 'server', 'jobs', 'analysis', 'worker-bootstrap.mjs'].join(path.sep);
}

const WorkerThread: typeof Worker = Reflect.get(threads, 'Worker');

/**
 * Refits participants under every model on worker threads (node:worker_threads, each loading
 * the analysis source through tsx): participants are split into about four chunks per worker,
 * handed out as workers free up, and the refits come back in the participants' order. Each
 * refit depends only on its participant, so the result is the same for any number of workers.
 */
export async function runRefits(participants: readonly ParticipantData[], options: RefitOptions & { workers?: number }): Promise<ParticipantRefit[]> {
  const { workers: requested, ...refit } = options;
  const count = Math.max(1, Math.min(requested ?? defaultRefitWorkers(), participants.length));
  const chunkSize = Math.max(1, Math.ceil(participants.length / (count * 4)));
  const chunks: Array<[number, number]> = [];
  for (let from = 0; from < participants.length; from += chunkSize) chunks.push([from, Math.min(participants.length, from + chunkSize)]);
  const out: ParticipantRefit[] = new Array(participants.length);
  if (chunks.length === 0) return out;
  const workers = Array.from({ length: count }, () => new WorkerThread(workerEntry()));
  let next = 0;
  let requestId = 0;
  try {
    await Promise.all(workers.map((w) => workerMessage<{ ready?: boolean }>(w, (m) => m?.ready === true, 'refit worker')));
    await Promise.all(
      workers.map(async (worker) => {
        while (next < chunks.length) {
          const [from, to] = chunks[next++];
          const id = ++requestId;
          const reply = workerMessage<{ id: number; refits?: ParticipantRefit[]; error?: string }>(worker, (m) => m?.id === id, 'refit worker');
          worker.postMessage({ id, participants: participants.slice(from, to), options: refit });
          const answer = await reply;
          if (answer.error !== undefined || !answer.refits) throw new Error(`refit worker: ${answer.error}`);
          answer.refits.forEach((r, i) => (out[from + i] = r));
        }
      }),
    );
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
  return out;
}
