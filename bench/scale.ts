// Scale-out benchmark: S1 (bench/power.ts) with 20,000 replications run on the shared queue by one
// worker process and by two (one thread each, each process starting its own thread), against a
// private Redis (scripts/redis.mjs, instance `bench`, BENCH_REDIS_PORT 6382). The ratio of the two
// times is the speed-up from the second worker: target ≥ 1.8 on a 2-core machine that nothing else
// loads. Both runs must give the same tallies. Then the queue's overhead per chunk: 200 one-replicate
// chunks through the queue against the same chunks on an in-process pool of one thread. Beside the ratio:
// the workers' CPU-seconds (the extra work a second process brings) and the machine's own ratio for two
// CPU-bound processes of plain arithmetic (what its two vCPUs give, whatever the code does).
// Skipped, with a note, when redis-server is not installed.
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import os from 'node:os';
import type { PowerScenario } from '@/lib/design/power';
import { runScenariosOnQueue } from '@/lib/server/jobs/power/queue';
import { runScenarios } from '@/lib/server/jobs/power/run-scenario';
import { closeSharedRedis } from '@/lib/server/redis';
import { S1 } from './power';
// plain Node helpers of the start scripts (no types of their own)
// @ts-expect-error -- scripts/redis.mjs is plain JavaScript
import { redisServerBinary, startRedis, stopRedis } from '../scripts/redis.mjs';

const LARGE: PowerScenario = { ...S1, replications: 20_000 };

async function startWorkers(count: number, url: string): Promise<ChildProcess[]> {
  const workers = Array.from({ length: count }, () =>
    spawn(process.execPath, ['--import', 'tsx', 'lib/server/jobs/worker-process.ts', '--threads', '1'], { env: { ...process.env, REDIS_URL: url }, stdio: ['ignore', 'pipe', 'inherit'] }),
  );
  await Promise.all(
    workers.map(
      (w) =>
        new Promise<void>((resolve, reject) => {
          let text = '';
          w.stdout!.on('data', (d) => {
            text += d;
            if (text.includes('taking power chunks')) resolve();
          });
          w.once('exit', (code) => reject(new Error(`a bench worker exited (${code}) before it was ready`)));
        }),
    ),
  );
  return workers;
}

async function stopWorkers(workers: ChildProcess[]): Promise<void> {
  await Promise.all(workers.map((w) => new Promise<void>((resolve) => (w.exitCode !== null ? resolve() : (w.once('exit', () => resolve()), w.kill('SIGTERM'))))));
}

/** CPU seconds (user + system) a process has used so far, from /proc (Linux); NaN elsewhere. */
function cpuSeconds(pid: number): number {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
    return (Number(fields[11]) + Number(fields[12])) / CLOCK_TICKS; // utime + stime, in clock ticks
  } catch {
    return NaN;
  }
}
const CLOCK_TICKS = 100; // USER_HZ: 100 on every Linux architecture Node supports

async function timedOnQueue(workerCount: number, url: string, scenario: PowerScenario, chunkSize?: number) {
  const workers = await startWorkers(workerCount, url);
  try {
    const before = workers.map((w) => cpuSeconds(w.pid!));
    const started = performance.now();
    const outcome = await runScenariosOnQueue([scenario], { chunkSize });
    const seconds = (performance.now() - started) / 1000;
    const cpu = workers.reduce((sum, w, i) => sum + cpuSeconds(w.pid!) - before[i], 0);
    return { seconds, cpu, outcome };
  } finally {
    await stopWorkers(workers);
  }
}

/**
 * What the machine itself gives a second CPU-bound process: a fixed integer loop in one child process,
 * then in two at once; the ratio of total work per second (2 × one's time / the pair's time). Two vCPUs
 * that share a physical core or a busy host give less than 2 whatever the code does.
 */
async function machineCeiling(): Promise<number> {
  const loop = 'let x = 0; for (let i = 0; i < 3e8; i++) x = (x + i * 7) % 1000003; if (x < 0) console.log(x);';
  const timed = async (count: number) => {
    const started = performance.now();
    await Promise.all(Array.from({ length: count }, () => new Promise<void>((resolve) => spawn(process.execPath, ['-e', loop], { stdio: 'ignore' }).once('exit', () => resolve()))));
    return (performance.now() - started) / 1000;
  };
  const one = await timed(1);
  const two = await timed(2);
  return (2 * one) / two;
}

export async function runScaleBench(): Promise<void> {
  console.log('\nScale-out: S1 with 20,000 replications on the shared queue (BullMQ over Redis)');
  if (!redisServerBinary()) {
    console.log('  skipped: redis-server is not installed (Debian package redis-server; `npm run start:cluster` installs it).');
    return;
  }
  const { REDIS_URL } = await startRedis({ instance: 'bench', log: () => {} });
  const before = process.env.REDIS_URL;
  process.env.REDIS_URL = REDIS_URL;
  try {
    const load = os.loadavg()[0];
    const one = await timedOnQueue(1, REDIS_URL, LARGE);
    const two = await timedOnQueue(2, REDIS_URL, LARGE);
    const same = JSON.stringify(one.outcome) === JSON.stringify(two.outcome);
    const ceiling = await machineCeiling();
    console.log(`  1 worker process:  ${one.seconds.toFixed(1)} s (${one.cpu.toFixed(1)} CPU-seconds)`);
    console.log(`  2 worker processes: ${two.seconds.toFixed(1)} s (${two.cpu.toFixed(1)} CPU-seconds between them: they share their calibration estimates through Redis, so only a vector both meet before either has shared it is estimated twice)`);
    console.log(`  ratio ${(one.seconds / two.seconds).toFixed(2)} (target ≥ 1.8 on an otherwise idle 2-core machine); identical tallies: ${same ? 'yes' : 'NO'}`);
    console.log(`  this machine's own ratio for two CPU-bound processes (a plain arithmetic loop): ${ceiling.toFixed(2)}`);
    console.log(`  load average at the start: ${load.toFixed(2)} on ${os.availableParallelism()} cores, ${os.loadavg()[0].toFixed(2)} at the end`);
    if (!same) throw new Error('the one- and two-worker runs gave different tallies');

    // overhead: one-replicate chunks, so their own work is small next to their handling; 200 chunks
    // minus 1 chunk on each path takes the thread and worker start-up out of the difference
    const tiny = (replications: number): PowerScenario => ({ ...S1, replications, sampleSizes: [20] });
    const inProcess = async (replications: number) => {
      const started = performance.now();
      await runScenarios([tiny(replications)], { workers: 1, chunkSize: 1 });
      return (performance.now() - started) / 1000;
    };
    const threadPerChunk = ((await inProcess(200)) - (await inProcess(1))) / 199;
    const queuePerChunk = ((await timedOnQueue(1, REDIS_URL, tiny(200), 1)).seconds - (await timedOnQueue(1, REDIS_URL, tiny(1), 1)).seconds) / 199;
    console.log(
      `  queue overhead: ${((queuePerChunk - threadPerChunk) * 1000).toFixed(1)} ms per chunk ` +
        `(a one-replicate chunk takes ${(queuePerChunk * 1000).toFixed(1)} ms through the queue, ${(threadPerChunk * 1000).toFixed(1)} ms on an in-process thread)`,
    );
  } finally {
    if (before === undefined) delete process.env.REDIS_URL;
    else process.env.REDIS_URL = before;
    await closeSharedRedis();
    await stopRedis({ instance: 'bench' });
  }
}
