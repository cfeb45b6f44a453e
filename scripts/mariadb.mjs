// A private MariaDB server per checkout, so `npm start` and `npm test` need no system service.
//
//   node scripts/mariadb.mjs start|stop|status [--instance app|test] [--fresh]
//
// Instances live in .data/<folder>: my.cnf (rewritten on every start), data/ (datadir),
// mariadbd.pid and error.log. `app` serves database `switchback` on DB_PORT (default 3307) with
// credentials kept in .env.local; `test` serves `switchback_test` on TEST_DB_PORT (default 3308)
// with credentials in .data/mariadb-test/credentials.json.
//
// Existing server: when DB_HOST is set in the environment (TEST_DB_HOST for the test instance), no
// private server is started or stopped; startDatabase() returns that server's host, port
// (default 3306), database, user and password from DB_* (or TEST_DB_*) as they are.
//
// Every mariadb tool call passes --defaults-file first: the tools only honour it in that place.
import { spawn } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import * as fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs, parseEnv } from 'node:util';
import { aptInstall, awaitProcessEnd, findExecutable, isLiveProcess, isRoot, readPidFile } from './system.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const ENV_FILE = path.join(ROOT, '.env.local');
const DB_USER = 'switchback';
const SBIN = ['/usr/sbin', '/usr/bin', '/usr/local/sbin', '/usr/local/bin'];
// sun_path holds 108 bytes including the terminating NUL.
const MAX_SOCKET_PATH = 107;
const START_TIMEOUT_MS = 60_000;
const STOP_TIMEOUT_MS = 60_000;

const INSTANCES = {
  app: { folder: '.data/mariadb', portVar: 'DB_PORT', defaultPort: 3307, database: 'switchback' },
  test: { folder: '.data/mariadb-test', portVar: 'TEST_DB_PORT', defaultPort: 3308, database: 'switchback_test' },
};

/** Paths, port and database of an instance; nothing is created. */
export function instanceConfig(instance = 'app') {
  const spec = INSTANCES[instance];
  if (!spec) throw new Error(`unknown database instance "${instance}" (expected: ${Object.keys(INSTANCES).join(', ')})`);
  const dir = path.join(ROOT, spec.folder);
  let socket = path.join(dir, 'mariadbd.sock');
  if (Buffer.byteLength(socket) > MAX_SOCKET_PATH) {
    const hash = createHash('sha256').update(dir).digest('hex').slice(0, 12);
    socket = path.join(os.tmpdir(), `switchback-${hash}.sock`);
  }
  return {
    instance,
    dir,
    socket,
    cnf: path.join(dir, 'my.cnf'),
    datadir: path.join(dir, 'data'),
    pidFile: path.join(dir, 'mariadbd.pid'),
    errorLog: path.join(dir, 'error.log'),
    credentials: path.join(dir, 'credentials.json'),
    port: String(process.env[spec.portVar] || spec.defaultPort),
    database: spec.database,
  };
}

/** The KEY=VALUE pairs of an env file, read with Node's own parser (the one behind --env-file). Missing file → {}. */
export function readEnvFile(file) {
  return fs.existsSync(file) ? parseEnv(fs.readFileSync(file, 'utf8')) : {};
}

/** The environment names of an instance's external server: DB_* for the app, TEST_DB_* for the tests. */
function externalPrefix(instance) {
  return instance === 'test' ? 'TEST_DB_' : 'DB_';
}

/**
 * True when the environment names an existing server for this instance (DB_HOST for the app,
 * TEST_DB_HOST for the tests, so the tests never write into the app's database). The processes
 * that `npm start` launches carry the private server's DB_HOST and SWITCHBACK_PRIVATE_DB=1, so
 * they are not mistaken for it.
 */
function isExternal(instance = 'app') {
  if (process.env.SWITCHBACK_PRIVATE_DB === '1') return false;
  return Boolean(process.env[`${externalPrefix(instance)}HOST`]);
}

function externalEnv(instance = 'app') {
  const p = externalPrefix(instance);
  const env = process.env;
  const name = env[`${p}NAME`];
  const user = env[`${p}USER`];
  if (!name || !user) throw new Error(`${p}HOST is set, so an existing MariaDB server is used; it also needs ${p}NAME and ${p}USER (and ${p}PASSWORD, ${p}PORT)`);
  return { DB_HOST: env[`${p}HOST`], DB_PORT: env[`${p}PORT`] || '3306', DB_NAME: name, DB_USER: user, DB_PASSWORD: env[`${p}PASSWORD`] ?? '' };
}

// --- tools -------------------------------------------------------------------------------------

function tool(name) {
  const found = findExecutable(name, SBIN);
  if (!found) throw new Error(`${name} not found; install the Debian packages mariadb-server and mariadb-client`);
  return found;
}

function ensureInstalled(log) {
  if (findExecutable('mariadbd', SBIN) && findExecutable('mariadb-admin', SBIN)) return;
  aptInstall(['mariadb-server', 'mariadb-client'], { reason: 'MariaDB (mariadbd) is not installed', log });
}

/** Runs a mariadb tool with --defaults-file first; resolves { code, stdout, stderr }. */
function runTool(name, cfg, args, { input, timeoutMs = 60_000 } = {}) {
  return new Promise((resolve) => {
    const child = spawn(tool(name), [`--defaults-file=${cfg.cnf}`, ...args], { stdio: ['pipe', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk) => (stdout += chunk));
    child.stderr.on('data', (chunk) => (stderr += chunk));
    const timer = setTimeout(() => child.kill('SIGKILL'), timeoutMs);
    child.on('error', (error) => {
      clearTimeout(timer);
      resolve({ code: 127, stdout, stderr: String(error) });
    });
    child.on('close', (code) => {
      clearTimeout(timer);
      resolve({ code: code ?? 1, stdout, stderr });
    });
    child.stdin.on('error', () => {});
    child.stdin.end(input ?? '');
  });
}

// mariadb-install-db --auth-root-authentication-method=socket makes the OS account that runs it
// the passwordless admin over the socket: `root` normally, the login name otherwise.
function adminUser() {
  return isRoot() ? 'root' : os.userInfo().username;
}

async function ping(cfg) {
  const { code } = await runTool('mariadb-admin', cfg, [`--user=${adminUser()}`, '--connect-timeout=2', 'ping'], {
    timeoutMs: 10_000,
  });
  return code === 0;
}

async function sql(cfg, statements) {
  const result = await runTool('mariadb', cfg, [`--user=${adminUser()}`, '--batch'], { input: statements });
  if (result.code !== 0) throw new Error(`MariaDB (${cfg.instance}) rejected the setup SQL: ${result.stderr.trim()}`);
  return result.stdout;
}

// --- process state -----------------------------------------------------------------------------

const SERVER_NAME = /^(mariadbd|mysqld)$/;
const readPid = (cfg) => readPidFile(cfg.pidFile);
// A pid counts as our server only if it is a live mariadbd (see isLiveProcess).
const isServerProcess = (pid) => isLiveProcess(pid, SERVER_NAME);

function removeStaleFiles(cfg) {
  for (const file of [cfg.pidFile, cfg.socket, `${cfg.socket}.lock`]) fs.rmSync(file, { force: true });
}

/** { running, pid, port, socket, dir } of an instance, without changing anything. */
export async function databaseStatus({ instance = 'app' } = {}) {
  const cfg = instanceConfig(instance);
  const pid = readPid(cfg);
  const running = isServerProcess(pid) && fs.existsSync(cfg.cnf) && (await ping(cfg));
  return { running, pid: running ? pid : null, port: cfg.port, socket: cfg.socket, dir: cfg.dir };
}

// --- configuration and credentials -------------------------------------------------------------

function cnfValue(value) {
  return /[\s#;"'\\]/.test(value) ? `"${value.replace(/\\/g, '\\\\').replace(/"/g, '\\"')}"` : value;
}

/**
 * InnoDB's page cache, in MB. The app's server gets an eighth of the machine's memory, from 128 MB
 * (MariaDB's default) up to 1 GB: participants' served items are kB of JSON each, so a study of a few
 * tens of thousands outgrows 128 MB, and then every write reads evicted pages back from disk. The test
 * server holds a few hundred rows and keeps the default.
 */
function bufferPoolMb(instance) {
  if (instance === 'test') return 128;
  const eighth = Math.floor(os.totalmem() / 8 / 2 ** 20 / 128) * 128;
  return Math.min(1024, Math.max(128, eighth));
}

function writeCnf(cfg) {
  const server = [
    `datadir=${cnfValue(cfg.datadir)}`,
    `socket=${cnfValue(cfg.socket)}`,
    `pid-file=${cnfValue(cfg.pidFile)}`,
    `port=${cfg.port}`,
    'bind-address=127.0.0.1',
    // mariadbd refuses to run as root unless told to; a non-root login runs it as itself.
    ...(isRoot() ? ['user=root'] : []),
    `log-error=${cnfValue(cfg.errorLog)}`,
    'skip-name-resolve',
    'character-set-server=utf8mb4',
    'collation-server=utf8mb4_unicode_ci',
    `innodb_buffer_pool_size=${bufferPoolMb(cfg.instance)}M`,
    'innodb_log_file_size=48M',
    'max_connections=300',
    // The test server is thrown away; flushing the log once a second instead of per commit
    // still survives a crash of mariadbd itself, only not of the machine.
    ...(cfg.instance === 'test' ? ['innodb_flush_log_at_trx_commit=2'] : []),
  ];
  const client = [`socket=${cnfValue(cfg.socket)}`, `port=${cfg.port}`];
  const text =
    `# Written by scripts/mariadb.mjs on every start of the "${cfg.instance}" instance; edits are overwritten.\n` +
    `[mariadbd]\n${server.join('\n')}\n\n[client]\n${client.join('\n')}\n`;
  fs.mkdirSync(cfg.dir, { recursive: true });
  fs.writeFileSync(cfg.cnf, text);
}

function newSecret(bytes) {
  return randomBytes(bytes).toString('base64url');
}

/** Adds the keys of `wanted` that .env.local lacks (never changes one); returns the file's values after. */
function ensureEnvFile(wanted, log) {
  const existing = readEnvFile(ENV_FILE);
  const missing = Object.keys(wanted).filter((key) => existing[key] === undefined || existing[key] === '');
  if (missing.length > 0) {
    const before = fs.existsSync(ENV_FILE) ? fs.readFileSync(ENV_FILE, 'utf8') : '# Local settings (git-ignored), written by scripts/mariadb.mjs.\n';
    const lines = missing.map((key) => `${key}=${wanted[key]}`).join('\n');
    fs.writeFileSync(ENV_FILE, `${before}${before.endsWith('\n') ? '' : '\n'}${lines}\n`, { mode: 0o600 });
    log(`Wrote ${missing.join(', ')} to .env.local`);
  }
  return { ...existing, ...Object.fromEntries(missing.map((key) => [key, String(wanted[key])])) };
}

// The app password and NEXTAUTH_SECRET are generated once and then only read back, so that a
// wiped datadir gets the same password again and signed-in sessions survive restarts.
function appCredentials(cfg, log) {
  const existing = ensureEnvFile(
    {
      DB_HOST: '127.0.0.1',
      DB_PORT: cfg.port,
      DB_NAME: cfg.database,
      DB_USER,
      DB_PASSWORD: newSecret(24),
      NEXTAUTH_SECRET: newSecret(32),
      NEXTAUTH_URL: 'http://127.0.0.1:3000',
    },
    log,
  );
  const password = existing.DB_PASSWORD;
  if (existing.DB_PORT && existing.DB_PORT !== cfg.port) {
    log(`Note: .env.local says DB_PORT=${existing.DB_PORT} but the server runs on ${cfg.port}; scripts pass the real port.`);
  }
  return { user: DB_USER, password };
}

function testCredentials(cfg) {
  try {
    const saved = JSON.parse(fs.readFileSync(cfg.credentials, 'utf8'));
    if (saved.user && saved.password) return saved;
  } catch {
    // Not written yet (or unreadable): make new ones below.
  }
  const created = { user: DB_USER, password: newSecret(24) };
  fs.writeFileSync(cfg.credentials, `${JSON.stringify(created, null, 2)}\n`, { mode: 0o600 });
  return created;
}

function sqlString(value) {
  return `'${String(value).replace(/\\/g, '\\\\').replace(/'/g, "\\'")}'`;
}

function setupStatements(cfg, { user, password }, fresh) {
  const db = `\`${cfg.database}\``;
  // The test user may create and drop any switchback_test* database, e.g. scratch schemas.
  const grantOn = cfg.instance === 'test' ? '`switchback\\_test%`.*' : `${db}.*`;
  const lines = [];
  if (fresh) lines.push(`DROP DATABASE IF EXISTS ${db};`);
  lines.push(`CREATE DATABASE IF NOT EXISTS ${db} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`);
  for (const host of ['127.0.0.1', 'localhost']) {
    const account = `${sqlString(user)}@${sqlString(host)}`;
    lines.push(`CREATE USER IF NOT EXISTS ${account} IDENTIFIED BY ${sqlString(password)};`);
    lines.push(`ALTER USER ${account} IDENTIFIED BY ${sqlString(password)};`);
    lines.push(`GRANT ALL PRIVILEGES ON ${grantOn} TO ${account};`);
  }
  return `${lines.join('\n')}\n`;
}

// --- start / stop ------------------------------------------------------------------------------

function readTail(file, fromByte, lines = 40) {
  try {
    const text = fs.readFileSync(file).subarray(fromByte).toString('utf8');
    return text.trimEnd().split('\n').slice(-lines).join('\n') || '(error.log is empty)';
  } catch {
    return '(no error.log)';
  }
}

function portIsFree(port) {
  return new Promise((resolve) => {
    const probe = net.createServer();
    probe.once('error', () => resolve(false));
    probe.listen({ port: Number(port), host: '127.0.0.1', exclusive: true }, () => probe.close(() => resolve(true)));
  });
}

const sleep = (ms) => new Promise((resolve) => setTimeout(resolve, ms));

async function initialiseDatadir(cfg, log) {
  log(`Creating a new MariaDB data directory in ${path.relative(ROOT, cfg.datadir)} ...`);
  const args = ['--skip-test-db', '--skip-name-resolve', '--auth-root-authentication-method=socket'];
  args.push(isRoot() ? '--user=root' : `--auth-root-socket-user=${adminUser()}`);
  const result = await runTool('mariadb-install-db', cfg, args, { timeoutMs: 180_000 });
  if (result.code !== 0 || !fs.existsSync(path.join(cfg.datadir, 'mysql'))) {
    fs.rmSync(cfg.datadir, { recursive: true, force: true }); // let the next run start over
    throw new Error(`mariadb-install-db failed:\n${result.stdout}${result.stderr}\n${readTail(cfg.errorLog, 0)}`);
  }
}

async function launch(cfg, log) {
  if (!(await portIsFree(cfg.port))) {
    const portVar = INSTANCES[cfg.instance].portVar;
    throw new Error(`port ${cfg.port} on 127.0.0.1 is taken by another program; set ${portVar} to a free port`);
  }
  const logStart = fs.existsSync(cfg.errorLog) ? fs.statSync(cfg.errorLog).size : 0;
  const out = fs.openSync(cfg.errorLog, 'a');
  const child = spawn(tool('mariadbd'), [`--defaults-file=${cfg.cnf}`], { detached: true, stdio: ['ignore', out, out] });
  fs.closeSync(out);
  let exit = null;
  child.on('exit', (code, signal) => (exit = code ?? signal));
  child.on('error', (error) => (exit = String(error)));
  child.unref();
  log(`Starting MariaDB (${cfg.instance}) on 127.0.0.1:${cfg.port} ...`);
  const deadline = Date.now() + START_TIMEOUT_MS;
  while (Date.now() < deadline) {
    if (exit !== null) break;
    if (await ping(cfg)) return;
    await sleep(250);
  }
  if (exit === null) process.kill(child.pid, 'SIGKILL');
  const why = exit === null ? `did not answer within ${START_TIMEOUT_MS / 1000} s` : `exited (${exit})`;
  throw new Error(`mariadbd (${cfg.instance}) ${why}. Last lines of ${cfg.errorLog}:\n${readTail(cfg.errorLog, logStart)}`);
}

/**
 * Starts (or reuses) the private server of `instance`, makes sure its database and application
 * user exist, and returns { DB_HOST, DB_PORT, DB_NAME, DB_USER, DB_PASSWORD } as strings, and for a
 * private server DB_SOCKET, its Unix socket.
 * `fresh` (test instance) drops and recreates the database.
 */
export async function startDatabase({ instance = 'app', fresh = false, log = console.log } = {}) {
  if (isExternal(instance)) {
    const env = externalEnv(instance);
    log(`Using the existing MariaDB at ${env.DB_HOST}:${env.DB_PORT} (${externalPrefix(instance)}HOST is set); no private server is started.`);
    if (fresh) log(`Note: ${env.DB_NAME} on that server is not emptied; the tests add their own rows to it.`);
    // the sign-in secret is still generated once and kept locally
    if (instance === 'app') ensureEnvFile({ NEXTAUTH_SECRET: newSecret(32), NEXTAUTH_URL: 'http://127.0.0.1:3000' }, log);
    return env;
  }
  const cfg = instanceConfig(instance);
  ensureInstalled(log);
  fs.mkdirSync(cfg.dir, { recursive: true });

  const pid = readPid(cfg);
  let running = false;
  if (isServerProcess(pid)) {
    // Alive: it may still be starting up, so give it the usual time to answer.
    const deadline = Date.now() + START_TIMEOUT_MS;
    while (!(running = await ping(cfg)) && Date.now() < deadline && isServerProcess(pid)) await sleep(250);
    if (!running && isServerProcess(pid)) {
      throw new Error(`mariadbd (pid ${pid}) is running but not answering; try: node scripts/mariadb.mjs stop --instance ${instance}`);
    }
  }
  if (!running) {
    if (pid) log(`Removing stale pid/socket files of MariaDB (${instance}) from an earlier crash.`);
    removeStaleFiles(cfg);
    writeCnf(cfg);
    if (!fs.existsSync(path.join(cfg.datadir, 'mysql'))) await initialiseDatadir(cfg, log);
    await launch(cfg, log);
  }

  const credentials = instance === 'app' ? appCredentials(cfg, log) : testCredentials(cfg);
  await sql(cfg, setupStatements(cfg, credentials, fresh));
  return {
    DB_HOST: '127.0.0.1',
    DB_PORT: cfg.port,
    DB_NAME: cfg.database,
    DB_USER: credentials.user,
    DB_PASSWORD: credentials.password,
    // the app connects over the server's Unix socket: less work per statement than TCP on loopback
    DB_SOCKET: cfg.socket,
  };
}

/** Shuts the private server of `instance` down cleanly and waits until its process is gone. No-op if not running. */
export async function stopDatabase({ instance = 'app', log = () => {} } = {}) {
  if (isExternal(instance)) return false;
  const cfg = instanceConfig(instance);
  const pid = readPid(cfg);
  if (!isServerProcess(pid)) {
    removeStaleFiles(cfg);
    return false;
  }
  log(`Stopping MariaDB (${instance}) ...`);
  if (!fs.existsSync(cfg.cnf)) writeCnf(cfg);
  const result = await runTool('mariadb-admin', cfg, [`--user=${adminUser()}`, 'shutdown'], { timeoutMs: STOP_TIMEOUT_MS });
  if (result.code !== 0) log(`mariadb-admin shutdown failed (${result.stderr.trim()}); sending SIGTERM instead.`);
  const signals = result.code === 0 ? [null, 'SIGTERM', 'SIGKILL'] : ['SIGTERM', 'SIGKILL'];
  await awaitProcessEnd(pid, SERVER_NAME, { signals, graceMs: STOP_TIMEOUT_MS, killMs: 10_000, label: 'mariadbd' });
  removeStaleFiles(cfg);
  return true;
}

// --- command line ------------------------------------------------------------------------------

async function main(argv) {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: { instance: { type: 'string', default: 'app' }, fresh: { type: 'boolean', default: false } },
  });
  const [command] = positionals;
  const { instance, fresh } = values;
  if (command === 'start') {
    const env = await startDatabase({ instance, fresh });
    const where = isExternal(instance) ? 'external server' : path.relative(ROOT, instanceConfig(instance).dir);
    console.log(`MariaDB (${instance}) is up: ${env.DB_USER}@${env.DB_HOST}:${env.DB_PORT}/${env.DB_NAME} (${where})`);
    if (env.DB_SOCKET) console.log(`Its socket, which the app connects through: DB_SOCKET=${env.DB_SOCKET}`);
    console.log(instance === 'app' ? 'The password is DB_PASSWORD in .env.local.' : `Credentials: ${instanceConfig(instance).credentials}`);
  } else if (command === 'stop') {
    const stopped = await stopDatabase({ instance, log: console.log });
    console.log(stopped ? `MariaDB (${instance}) stopped.` : `MariaDB (${instance}) was not running.`);
  } else if (command === 'status') {
    const status = await databaseStatus({ instance });
    console.log(
      status.running
        ? `MariaDB (${instance}) is running: pid ${status.pid}, 127.0.0.1:${status.port}, socket ${status.socket}`
        : `MariaDB (${instance}) is not running.`,
    );
    process.exitCode = status.running ? 0 : 3;
  } else {
    console.error('usage: node scripts/mariadb.mjs start|stop|status [--instance app|test] [--fresh]');
    process.exitCode = 2;
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  main(process.argv.slice(2)).catch((error) => {
    console.error(`scripts/mariadb.mjs: ${error.message}`);
    process.exitCode = 1;
  });
}
