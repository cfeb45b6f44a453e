// Entry of a refit worker thread, loaded through tsx: refits the participants it is sent.
import { parentPort } from 'node:worker_threads';
import { refitParticipant, type ParticipantData, type RefitOptions } from '../../../design';

type Request = { id: number; participants: ParticipantData[]; options: RefitOptions };

parentPort?.on('message', (request: Request) => {
  try {
    const refits = request.participants.map((p) => refitParticipant(p, request.options));
    parentPort?.postMessage({ id: request.id, refits });
  } catch (error) {
    parentPort?.postMessage({ id: request.id, error: error instanceof Error ? `${error.name}: ${error.message}` : String(error) });
  }
});

// tell the pool the listener is in place: messages sent while tsx was still loading this file could be missed
parentPort?.postMessage({ ready: true });
