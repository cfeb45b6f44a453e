// The refit task run in a worker thread (bundled into plain JavaScript by worker-bundle.ts).
import { refitParticipant, type ParticipantData, type ParticipantRefit, type RefitOptions } from '../../../design';

export type RefitTask = { participants: ParticipantData[]; options: RefitOptions };

/** Answers once the thread has loaded this module: a queue worker process starts each thread's load before it takes chunks. */
export function loaded(): true {
  return true;
}

/** Refits the participants it is given, in their order. */
export function refitChunk(task: RefitTask): ParticipantRefit[] {
  return task.participants.map((p) => refitParticipant(p, task.options));
}
