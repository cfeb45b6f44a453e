/**
 * What a running power run says while its chunks wait on the shared queue (REDIS_URL) and no
 * queue worker listens: the run page shows it, the power list shortens it. It is cleared as soon
 * as a worker listens again, and the run continues where it stood.
 */
export const WAITING_FOR_WORKER_MESSAGE =
  'Waiting for a queue worker: none is listening on the shared queue, so no replicates are being computed. ' +
  'Start `npm run worker` (on this machine, or on another pointed at the same Redis and MariaDB); the run then continues where it stands.';

/** What a power run computed by the web server's own threads says: no queue worker listened when it started. */
export const RAN_IN_PROCESS_MESSAGE =
  'No queue worker was listening when this run started, so the web server computes it on its own threads. ' +
  'Start `npm run worker` to spread later runs over worker processes.';
