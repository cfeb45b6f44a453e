// A private Redis server per checkout, for the job queue and the state several app processes share
// (`npm run start:cluster`, the tests and the benchmark that need one). `npm start` needs none.
//
//   node scripts/redis.mjs start|stop|status [--instance app|test|bench]
//
// Instances live in .data/<folder>: redis.conf (rewritten on every start), data/ (its dump),
// redis.pid and redis.log; loopback only, a port of their own: `app` on REDIS_PORT (default 6381),
// `test` on TEST_REDIS_PORT (6380), `bench` on BENCH_REDIS_PORT (6382). The server comes from
// Debian's redis-server package, installed with apt-get when missing.
//
// Existing server: when REDIS_URL is set (TEST_REDIS_URL for the tests, BENCH_REDIS_URL for the
// benchmark), nothing is started or stopped and that address is returned as it is.
import { spawn } from 'node:child_process';
import * as fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { aptInstall, awaitProcessEnd, findExecutable, isLiveProcess, readPidFile } from './system.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const SBIN = ['/usr/bin', '/usr/sbin', '/usr/local/bin', '/usr/local/sbin'];
const START_TIMEOUT_MS = 30_000;
const STOP_TIMEOUT_MS = 30_000;

const INSTANCES = {
  app: { folder: '.data/redis', portVar: 'REDIS_PORT', defaultPort: 6381, urlVar: 'REDIS_URL', persist: true },
  test: { folder: '.data/redis-test', portVar: 'TEST_REDIS_PORT', defaultPort: 6380, urlVar: 'TEST_REDIS_URL', persist: false },
  bench: { folder: '.data/redis-bench', portVar: 'BENCH_REDIS_PORT', defaultPort: 6382, urlVar: 'BENCH_REDIS_URL', persist: false },
};

/** Paths and port of an instance; nothing is created. */
export function redisConfig(instance = 'app') {
  const spec = INSTANCES[instance];
  if (!spec) throw new Error(`unknown Redis instance "${instance}" (expected: ${Object.keys(INSTANCES).join(', ')})`);
  const dir = path.join(ROOT, spec.folder);
  return {
    instance,
    spec,
    dir,
    conf: path.join(dir, 'redis.conf'),
    datadir: path.join(dir, 'data'),
    pidFile: path.join(dir, 'redis.pid'),
    logFile: path.join(dir, 'redis.log'),
    port: Number(process.env[spec.portVar] || spec.defaultPort),
  };
}

/** The redis-server binary, or null when Debian's package is not installed. */
export function redisServerBinary() {
  return findExecutable('redis-server', SBIN);
}

function ensureInstalled(log) {
  if (redisServerBinary()) return;
  aptInstall(['redis-server'], { reason: 'Redis (redis-server) is not installed', log });
  if (!redisServerBinary()) throw new Error('apt-get finished but redis-server is still missing');
}

function quote(value) {
  return `"${String(value).replace(/\\/g, '\\\\').replace(/"/g, '\\"')}"`;
}

function writeConf(cfg) {
  const lines = [
    `# Written by scripts/redis.mjs on every start of the "${cfg.instance}" instance; edits are overwritten.`,
    'bind 127.0.0.1',
    'protected-mode yes',
    `port ${cfg.port}`,
    'daemonize no',
    `pidfile ${quote(cfg.pidFile)}`,
    `logfile ${quote(cfg.logFile)}`,
    `dir ${quote(cfg.datadir)}`,
    // the queue's jobs must never be evicted to make room (BullMQ asks for this policy)
    'maxmemory-policy noeviction',
    // the app's queue survives a restart; the test and benchmark servers are thrown away
    ...(cfg.spec.persist ? ['save 60 1', 'appendonly no'] : ['save ""', 'appendonly no']),
  ];
  fs.mkdirSync(cfg.datadir, { recursive: true });
  fs.writeFileSync(cfg.conf, `${lines.join('\n')}\n`);
}

/** Sends one inline command and resolves with the first reply line, or null when nothing answers. */
function command(port, text, timeoutMs = 2000) {
  return new Promise((resolve) => {
    const socket = net.connect({ port, host: '127.0.0.1' });
    let reply = '';
    const done = (value) => {
      socket.destroy();
      resolve(value);
    };
    socket.setTimeout(timeoutMs, () => done(null));
    socket.on('error', () => done(null));
    socket.on('connect', () => socket.write(`${text}\r\n`));
    socket.on('data', (data) => {
      reply += data.toString('utf8');
      if (reply.includes('\r\n')) done(reply.split('\r\n')[0]);
    });
    socket.on('close', () => done(reply ? reply.split('\r\n')[0] : null));
  });
}

async function ping(port) {
  return (await command(port, 'PING')) === '+PONG';
}

const SERVER_NAME = /^redis-server/;
const readPid = (cfg) => readPidFile(cfg.pidFile);
// A pid counts as our server only if it is a live redis-server (see isLiveProcess).
const isServerProcess = (pid) => isLiveProcess(pid, SERVER_NAME);

function portIsFree(port) {
  return new Promise((resolve) => {
    const probe = net.createServer();
    probe.once('error', () => resolve(false));
    probe.listen({ port, host: '127.0.0.1', exclusive: true }, () => probe.close(() => resolve(true)));
  });
}

const sleep = (ms) => new Promise((resolve) => setTimeout(resolve, ms));

function tail(file, lines = 20) {
  try {
    return fs.readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '(no redis.log)';
  }
}

/**
 * Starts (or reuses) the private Redis of `instance` and returns { REDIS_URL }. With the instance's
 * URL variable set (REDIS_URL, TEST_REDIS_URL, BENCH_REDIS_URL), that server is used instead.
 */
export async function startRedis({ instance = 'app', log = console.log } = {}) {
  const cfg = redisConfig(instance);
  const external = process.env[cfg.spec.urlVar];
  if (external && process.env.SWITCHBACK_PRIVATE_REDIS !== '1') {
    log(`Using the existing Redis at ${external.replace(/\/\/[^@/]*@/, '//…@')} (${cfg.spec.urlVar} is set); no private server is started.`);
    return { REDIS_URL: external };
  }
  ensureInstalled(log);
  const url = `redis://127.0.0.1:${cfg.port}`;
  const pid = readPid(cfg);
  if (isServerProcess(pid) && (await ping(cfg.port))) return { REDIS_URL: url };
  if (pid) log(`Removing the stale pid file of Redis (${instance}) from an earlier crash.`);
  fs.rmSync(cfg.pidFile, { force: true });
  if (!(await portIsFree(cfg.port))) throw new Error(`port ${cfg.port} on 127.0.0.1 is taken by another program; set ${cfg.spec.portVar} to a free port`);
  writeConf(cfg);
  log(`Starting Redis (${instance}) on 127.0.0.1:${cfg.port} ...`);
  const child = spawn(redisServerBinary(), [cfg.conf], { detached: true, stdio: 'ignore' });
  let exit = null;
  child.on('exit', (code, signal) => (exit = code ?? signal));
  child.on('error', (error) => (exit = String(error)));
  child.unref();
  const deadline = Date.now() + START_TIMEOUT_MS;
  while (Date.now() < deadline && exit === null) {
    if (await ping(cfg.port)) return { REDIS_URL: url };
    await sleep(100);
  }
  if (exit === null) process.kill(child.pid, 'SIGKILL');
  throw new Error(`redis-server (${instance}) ${exit === null ? 'did not answer in time' : `exited (${exit})`}. Last lines of ${cfg.logFile}:\n${tail(cfg.logFile)}`);
}

/** Shuts the private Redis of `instance` down (saving its data when it keeps any) and waits until it is gone. */
export async function stopRedis({ instance = 'app', log = () => {} } = {}) {
  const cfg = redisConfig(instance);
  if (process.env[cfg.spec.urlVar] && process.env.SWITCHBACK_PRIVATE_REDIS !== '1') return false;
  const pid = readPid(cfg);
  if (!isServerProcess(pid)) {
    fs.rmSync(cfg.pidFile, { force: true });
    return false;
  }
  log(`Stopping Redis (${instance}) ...`);
  await command(cfg.port, cfg.spec.persist ? 'SHUTDOWN SAVE' : 'SHUTDOWN NOSAVE');
  await awaitProcessEnd(pid, SERVER_NAME, { signals: [null, 'SIGTERM', 'SIGKILL'], graceMs: STOP_TIMEOUT_MS / 2, killMs: 5_000, label: 'redis-server' });
  fs.rmSync(cfg.pidFile, { force: true });
  return true;
}

async function main(argv) {
  const { values, positionals } = parseArgs({ args: argv, allowPositionals: true, options: { instance: { type: 'string', default: 'app' } } });
  const [verb] = positionals;
  const { instance } = values;
  if (verb === 'start') {
    const { REDIS_URL } = await startRedis({ instance });
    console.log(`Redis (${instance}) is up: ${REDIS_URL}`);
  } else if (verb === 'stop') {
    console.log((await stopRedis({ instance, log: console.log })) ? `Redis (${instance}) stopped.` : `Redis (${instance}) was not running.`);
  } else if (verb === 'status') {
    const cfg = redisConfig(instance);
    const running = isServerProcess(readPid(cfg)) && (await ping(cfg.port));
    console.log(running ? `Redis (${instance}) is running on 127.0.0.1:${cfg.port} (pid ${readPid(cfg)}).` : `Redis (${instance}) is not running.`);
    process.exitCode = running ? 0 : 3;
  } else {
    console.error('usage: node scripts/redis.mjs start|stop|status [--instance app|test|bench]');
    process.exitCode = 2;
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  main(process.argv.slice(2)).catch((error) => {
    console.error(`scripts/redis.mjs: ${error.message}`);
    process.exitCode = 1;
  });
}
