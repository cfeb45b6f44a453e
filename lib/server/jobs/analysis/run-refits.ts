import type { ParticipantData, ParticipantRefit, RefitOptions } from '@/lib/design';
import { powerEnv } from '@/lib/server/env';
import { createThreadPool, threadCount, threadError } from '../thread-pool';
import type { RefitTask } from './worker';

/** Default worker count: ANALYSIS_WORKERS if set, else the machine's available parallelism (at most 8). */
export function defaultRefitWorkers(): number {
  return threadCount(powerEnv().ANALYSIS_WORKERS);
}

/**
 * Refits participants under every model on a pool of worker threads (piscina): participants are
 * split into about four chunks per thread, handed out as threads free up, and the refits come
 * back in the participants' order. Each refit depends only on its participant, so the result is
 * the same for any number of threads.
 */
export async function runRefits(participants: readonly ParticipantData[], options: RefitOptions & { workers?: number }): Promise<ParticipantRefit[]> {
  const { workers: requested, ...refit } = options;
  const count = Math.max(1, Math.min(requested ?? defaultRefitWorkers(), participants.length));
  const chunkSize = Math.max(1, Math.ceil(participants.length / (count * 4)));
  const chunks: Array<[number, number]> = [];
  for (let from = 0; from < participants.length; from += chunkSize) chunks.push([from, Math.min(participants.length, from + chunkSize)]);
  const out: ParticipantRefit[] = new Array(participants.length);
  if (chunks.length === 0) return out;
  const pool = await createThreadPool<RefitTask, ParticipantRefit[]>('analysis', count);
  try {
    await Promise.all(
      chunks.map(async ([from, to]) => {
        const refits = await pool.run({ participants: participants.slice(from, to), options: refit }).catch((error: unknown) => {
          throw threadError('refit', error);
        });
        refits.forEach((r, i) => (out[from + i] = r));
      }),
    );
  } finally {
    await pool.destroy();
  }
  return out;
}
