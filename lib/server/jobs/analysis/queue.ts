import { randomUUID } from 'node:crypto';
import type { ParticipantData, ParticipantRefit, RefitOptions } from '@/lib/design';
import { runChunksOnQueue } from '../chunk-queue';
import type { RefitTask } from './worker';

/** Participants per queued chunk: enough work per chunk to outweigh its trip through Redis. */
export const REFITS_PER_CHUNK = 25;

/**
 * Refits participants on the shared queue (REDIS_URL): chunks of REFITS_PER_CHUNK participants,
 * each taken by whichever worker process is free, and the refits put back in the participants'
 * order. Each refit depends only on its participant, so the result equals runRefits' (and the
 * one-by-one refits') for any number of workers.
 */
export async function runRefitsOnQueue(participants: readonly ParticipantData[], options: RefitOptions & { label?: string }): Promise<ParticipantRefit[]> {
  const { label, ...refit } = options;
  const tasks: RefitTask[] = [];
  for (let from = 0; from < participants.length; from += REFITS_PER_CHUNK) tasks.push({ participants: participants.slice(from, from + REFITS_PER_CHUNK), options: refit });
  if (tasks.length === 0) return [];
  const results = await runChunksOnQueue<RefitTask, ParticipantRefit[]>('analysis', `${label ?? 'refits'}-${randomUUID()}`, tasks);
  return results!.flat(); // never stopped, so never null
}
