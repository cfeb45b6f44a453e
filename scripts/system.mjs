// Helpers shared by the start, test and database scripts: system packages and child processes.
// Plain Node ESM with built-ins only, so it runs before (or without) `npm ci`.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

export function isRoot() {
  return typeof process.getuid === 'function' && process.getuid() === 0;
}

/** Absolute path of an executable found in `extraDirs` or on PATH, or null. */
export function findExecutable(name, extraDirs = []) {
  const dirs = [...extraDirs, ...(process.env.PATH ?? '').split(path.delimiter)].filter(Boolean);
  for (const dir of dirs) {
    const candidate = path.join(dir, name);
    if (existsSync(candidate)) return candidate;
  }
  return null;
}

let aptUpdated = false;

/**
 * Installs Debian packages with apt-get (root only), running `apt-get update` once per process.
 * Waits for a dpkg lock held by another apt run instead of failing at once.
 */
export function aptInstall(packages, { reason, log = console.log } = {}) {
  if (!isRoot()) {
    throw new Error(
      `${reason}: install the Debian packages ${packages.join(' ')} ` +
        `(sudo apt-get install -y ${packages.join(' ')}) and run this again.`,
    );
  }
  const lockWait = ['-o', 'DPkg::Lock::Timeout=300'];
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  log(`${reason}: installing ${packages.join(' ')} with apt-get.`);
  if (!aptUpdated) {
    log('$ apt-get update');
    const update = spawnSync('apt-get', [...lockWait, 'update'], { stdio: 'inherit', env });
    if (update.status !== 0) throw new Error(`apt-get update failed (exit ${update.status ?? update.signal})`);
    aptUpdated = true;
  }
  log(`$ DEBIAN_FRONTEND=noninteractive apt-get install -y ${packages.join(' ')}`);
  const install = spawnSync('apt-get', [...lockWait, 'install', '-y', ...packages], { stdio: 'inherit', env });
  if (install.status !== 0) {
    throw new Error(`apt-get install ${packages.join(' ')} failed (exit ${install.status ?? install.signal})`);
  }
}

/** Makes sure the system Chromium used by the browser tests exists (Playwright's own is never downloaded). */
export async function ensureChromium({ log = console.log } = {}) {
  const chromium = '/usr/bin/chromium';
  if (existsSync(chromium)) return chromium;
  aptInstall(['chromium', 'fonts-dejavu-core'], { reason: `${chromium} is missing`, log });
  if (!existsSync(chromium)) throw new Error(`apt-get finished but ${chromium} is still missing`);
  return chromium;
}

// ---------------------------------------------------------------------------------------------
// Child processes. Every child gets its own process group (detached), so stopping it also stops
// whatever it spawned (npx -> next -> workers) and nothing outlives the script.

/** Spawns `npx --no-install <args>` (never fetches a package that is not installed). */
export function spawnNpx(args, { env = process.env, stdio = 'inherit', cwd } = {}) {
  return spawn('npx', ['--no-install', ...args], { env, stdio, cwd, detached: true });
}

/**
 * The node arguments of the production server (scripts/serve.mjs, Next plus the probe-items API
 * answered directly) on 127.0.0.1:`port`, as `npm start` and `npm test` run it. Each session-API
 * request allocates a few kB of short-lived objects (the parsed body, the reply's JSON); a young
 * generation of 32 MB semi-spaces instead of Node's default 16 MB halves how often they are
 * collected: under `npm run bench:api` the server's time in the garbage collector fell from 1.7 s
 * to 1.2 s.
 */
export function serverArgs(port) {
  return ['--max-semi-space-size=32', 'scripts/serve.mjs', '-H', '127.0.0.1', '-p', String(port)];
}

/** Spawns `node <args>` with this Node binary, in its own process group like spawnNpx. */
export function spawnNode(args, { env = process.env, stdio = 'inherit', cwd } = {}) {
  return spawn(process.execPath, args, { env, stdio, cwd, detached: true });
}

/** Resolves with the exit code of a child (signals map to 128 + n like a shell). */
export function waitForExit(child) {
  if (child.exitCode !== null) return Promise.resolve(child.exitCode);
  if (child.signalCode !== null) return Promise.resolve(128 + signalNumber(child.signalCode));
  return new Promise((resolve) => {
    child.once('exit', (code, signal) => resolve(code ?? 128 + signalNumber(signal)));
    child.once('error', () => resolve(127));
  });
}

function signalNumber(signal) {
  return { SIGHUP: 1, SIGINT: 2, SIGKILL: 9, SIGTERM: 15 }[signal] ?? 1;
}

function signalGroup(child, signal) {
  try {
    process.kill(-child.pid, signal);
  } catch {
    // The group is already gone.
  }
}

/** Stops a child's whole process group: SIGTERM, then SIGKILL after `graceMs`. */
export async function stopChild(child, { graceMs = 10_000 } = {}) {
  if (!child?.pid) return;
  const exited = waitForExit(child);
  signalGroup(child, 'SIGTERM');
  let timer;
  const timedOut = new Promise((resolve) => (timer = setTimeout(() => resolve('timeout'), graceMs)));
  const outcome = await Promise.race([exited, timedOut]);
  clearTimeout(timer);
  // Even after the leader exits, members of its group may linger; SIGKILL sweeps them.
  signalGroup(child, 'SIGKILL');
  if (outcome === 'timeout') await exited;
}

/** Polls `url` until it answers (any HTTP status, or only 2xx with `okOnly`), the child dies, or time runs out. */
export async function waitForHttp(url, { timeoutMs = 120_000, okOnly = false, child } = {}) {
  const deadline = Date.now() + timeoutMs;
  let last = 'no answer';
  while (Date.now() < deadline) {
    if (child && (child.exitCode !== null || child.signalCode !== null)) {
      throw new Error(`the server exited (${child.exitCode ?? child.signalCode}) before ${url} answered`);
    }
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(5_000) });
      if (!okOnly || res.ok) return res.status;
      last = `HTTP ${res.status}`;
    } catch (error) {
      last = error.cause?.code ?? error.message;
    }
    await new Promise((resolve) => setTimeout(resolve, 500));
  }
  throw new Error(`${url} did not answer within ${Math.round(timeoutMs / 1000)} s (last: ${last})`);
}

/**
 * Optional hook for local stand-ins of outside services (scripts/services.mjs).
 * Returns `{ env, stop }`; a missing file means there is nothing to start.
 */
export async function startLocalServices(root, env) {
  const file = path.join(root, 'scripts', 'services.mjs');
  if (!existsSync(file)) return { env: {}, stop: async () => {} };
  const { startServices } = await import(pathToFileURL(file).href);
  const started = (await startServices(env)) ?? {};
  return { env: started.env ?? {}, stop: started.stop ?? (async () => {}) };
}

/** The pid a private server wrote to `file`, or null when there is none. */
export function readPidFile(file) {
  try {
    const pid = Number.parseInt(readFileSync(file, 'utf8'), 10);
    return Number.isInteger(pid) && pid > 0 ? pid : null;
  } catch {
    return null;
  }
}

/**
 * Whether `pid` is a live (not zombie) process whose name matches `name`: after `kill -9` a
 * process can linger as a zombie when nothing reaps it, and pids get reused after a reboot.
 */
export function isLiveProcess(pid, name) {
  if (!pid) return false;
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    const state = stat.slice(stat.lastIndexOf(')') + 2, stat.lastIndexOf(')') + 3);
    const comm = readFileSync(`/proc/${pid}/comm`, 'utf8').trim();
    return state !== 'Z' && state !== 'X' && name.test(comm);
  } catch (error) {
    if (error.code !== 'ENOENT' || existsSync('/proc/self/stat')) return false;
    try {
      process.kill(pid, 0); // No /proc (not Linux): existence is the best we can tell.
      return true;
    } catch {
      return false;
    }
  }
}

/**
 * Waits for a server asked to stop to be gone, sending each of `signals` in turn (null: only wait)
 * and waiting `graceMs` after each (`killMs` after SIGKILL); throws naming `label` if it outlives them.
 */
export async function awaitProcessEnd(pid, name, { signals, graceMs, killMs, label }) {
  for (const signal of signals) {
    if (signal && isLiveProcess(pid, name)) process.kill(pid, signal);
    const deadline = Date.now() + (signal === 'SIGKILL' ? killMs : graceMs);
    while (isLiveProcess(pid, name) && Date.now() < deadline) await new Promise((resolve) => setTimeout(resolve, 100));
    if (!isLiveProcess(pid, name)) return;
  }
  throw new Error(`${label} (pid ${pid}) did not stop`);
}
