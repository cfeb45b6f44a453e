// `npm run start:cluster`: a private Redis on loopback (Debian's redis-server, installed with apt-get
// if missing, data in .data/redis), the app as `npm start` runs it but with REDIS_URL set (power runs
// go to the shared queue, the session API's rate limit and key revocation are shared), and N queue
// workers (`npm run worker`). Ctrl-C stops them all, the Redis and the app's MariaDB included.
//
//   npm run start:cluster [-- --workers N] [-- --threads T] [-- --dev]   (N workers of T threads; default
//   1 of all cores; --dev runs the app as `npm run dev` does)
//
// With REDIS_URL already set, that Redis is used and left running. Workers on other machines join by
// running `REDIS_URL=redis://<this machine>:<port> npm run worker` (see README, "Several machines").
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { startRedis, stopRedis } from './redis.mjs';
import { spawnNode, spawnNpx, stopChild, waitForExit } from './system.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const log = (message) => console.log(`[switchback cluster] ${message}`);
const { values: flags } = parseArgs({ options: { workers: { type: 'string', default: '1' }, threads: { type: 'string' }, dev: { type: 'boolean', default: false } } });
const workerCount = Number.parseInt(flags.workers, 10);
if (!Number.isInteger(workerCount) || workerCount < 0 || workerCount > 32) {
  console.error('--workers must be a whole number from 0 to 32');
  process.exit(2);
}
const threads = flags.threads ?? String(Math.max(1, Math.floor(os.availableParallelism() / Math.max(1, workerCount))));

let app = null;
const workers = [];
let redisStarted = false;
let shuttingDown = null;

function shutdown(code) {
  shuttingDown ??= (async () => {
    log('Stopping the workers ...');
    await Promise.all(workers.map((w) => stopChild(w, { graceMs: 15_000 })));
    if (app) await stopChild(app, { graceMs: 60_000 }); // scripts/start.mjs stops the app and its MariaDB
    if (redisStarted) await stopRedis({ instance: 'app', log }).catch((error) => log(`stopping Redis failed: ${error.message}`));
    process.exit(code);
  })();
  return shuttingDown;
}
process.on('SIGINT', () => shutdown(130));
process.on('SIGTERM', () => shutdown(143));
process.on('SIGHUP', () => shutdown(129));

async function main() {
  const external = Boolean(process.env.REDIS_URL);
  const { REDIS_URL } = await startRedis({ instance: 'app', log });
  redisStarted = !external;
  const env = { ...process.env, REDIS_URL };
  for (let i = 0; i < workerCount; i++) {
    const worker = spawnNpx(['tsx', 'lib/server/jobs/worker-process.ts', '--threads', threads], { env, cwd: ROOT });
    waitForExit(worker).then((code) => {
      if (!shuttingDown) log(`worker ${i + 1} exited (${code}); the others go on (restart it with npm run worker).`);
    });
    workers.push(worker);
  }
  log(`${workerCount} queue worker${workerCount === 1 ? '' : 's'} of ${threads} thread${threads === '1' ? '' : 's'} on ${REDIS_URL}`);
  app = spawnNode(['scripts/start.mjs', ...(flags.dev ? ['--dev'] : [])], { env, cwd: ROOT });
  const code = await waitForExit(app);
  app = null;
  if (!shuttingDown) {
    log(`The app exited (${code}).`);
    await shutdown(code === 0 ? 0 : 1);
  }
}

main().catch((error) => {
  console.error(`[switchback cluster] ${error.message}`);
  shutdown(1);
});
