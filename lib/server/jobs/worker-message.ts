import type { Worker } from 'node:worker_threads';

/**
 * Resolves with the first message from `worker` that `accept`s, and stops listening; rejects when the
 * worker throws or exits first (`${label} stopped (exit code N)`), so a dead worker never leaves a
 * caller waiting. Shared by the power and refit worker pools.
 */
export function workerMessage<T>(worker: Worker, accept: (message: T) => boolean, label: string): Promise<T> {
  return new Promise((resolve, reject) => {
    const onMessage = (message: T) => {
      if (!accept(message)) return;
      cleanup();
      resolve(message);
    };
    const onError = (error: Error) => {
      cleanup();
      reject(error);
    };
    const onExit = (code: number) => {
      cleanup();
      reject(new Error(`${label} stopped (exit code ${code})`));
    };
    const cleanup = () => {
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
    };
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
  });
}
