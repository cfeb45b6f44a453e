// The refit task run in a worker thread (bundled into plain JavaScript by worker-bundle.ts).
import { refitParticipant, type ParticipantData, type ParticipantRefit, type RefitOptions } from '../../../design';

export type RefitTask = { participants: ParticipantData[]; options: RefitOptions };

/** Refits the participants it is given, in their order. */
export function refitChunk(task: RefitTask): ParticipantRefit[] {
  return task.participants.map((p) => refitParticipant(p, task.options));
}
