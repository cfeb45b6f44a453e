// `npm start` (production build) and `npm run dev` (`--dev`, hot reload): one command brings up
// the private MariaDB, migrates and seeds it, starts local services, builds when sources changed,
// and runs the app on 127.0.0.1:$PORT (3000): `next dev`, or scripts/serve.mjs over the build.
// Ctrl-C or the app exiting stops everything again.
import { existsSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { readEnvFile, startDatabase, stopDatabase } from './mariadb.mjs';
import { demoAccounts, demoGroup } from '../db/seeders/demo-accounts.mjs';
import { serverArgs, spawnNode, spawnNpx, startLocalServices, stopChild, waitForExit, waitForHttp } from './system.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const { values: options } = parseArgs({ options: { dev: { type: 'boolean', default: false } } });
const { dev } = options;
const port = process.env.PORT || '3000';
// next.config.mjs honours NEXT_DIST_DIR so several servers of one checkout can run side by side.
const DIST_DIR = path.join(ROOT, process.env.NEXT_DIST_DIR || '.next');
const BUILD_MARK = path.join(DIST_DIR, 'SWITCHBACK_BUILD_FOR');
const log = (message) => console.log(`[switchback] ${message}`);

let child = null;
let services = null;
let shuttingDown = null;

/** Stops the current child, the local services and the database, once; then exits. */
function shutdown(code) {
  shuttingDown ??= (async () => {
    if (child) await stopChild(child);
    if (services) await services.stop().catch((error) => log(`stopping services failed: ${error.message}`));
    log('Stopping the database ...');
    await stopDatabase({ instance: 'app' }).catch((error) => log(`stopping MariaDB failed: ${error.message}`));
    process.exit(code);
  })();
  return shuttingDown;
}

process.on('SIGINT', () => shutdown(130));
process.on('SIGTERM', () => shutdown(143));
process.on('SIGHUP', () => shutdown(129));

/** Runs `npx <args>` to completion; a non-zero exit stops the whole start. */
async function step(title, args, env) {
  log(title);
  child = spawnNpx(args, { env });
  const code = await waitForExit(child);
  child = null;
  if (shuttingDown) await shuttingDown;
  if (code !== 0) throw new Error(`${title} failed (npx ${args.join(' ')} exited with ${code})`);
}

function newestSourceTime() {
  const skip = new Set(['node_modules', '.data', '.git']);
  let newest = 0;
  const visit = (entry) => {
    if (!existsSync(entry)) return;
    const stat = statSync(entry);
    newest = Math.max(newest, stat.mtimeMs);
    if (!stat.isDirectory()) return;
    for (const name of readdirSync(entry)) if (!skip.has(name)) visit(path.join(entry, name));
  };
  for (const dir of ['app', 'components', 'lib', 'db', 'public', 'fonts', 'types']) visit(path.join(ROOT, dir));
  const configs = readdirSync(ROOT).filter((name) =>
    /^(next|postcss|tailwind)\.config\.|^(package\.json|package-lock\.json|tsconfig\.json|middleware\.ts|proxy\.ts)$/.test(name),
  );
  for (const name of configs) visit(path.join(ROOT, name));
  return newest;
}

// `npm test` builds into .next-test, so a test run leaves this build alone; a build marked as a
// test build (someone pointed both at one folder) is still redone.
function needsBuild() {
  const buildId = path.join(DIST_DIR, 'BUILD_ID');
  if (!existsSync(buildId) || !existsSync(BUILD_MARK)) return true;
  if (readEnvFile(BUILD_MARK).FOR !== 'app') return true;
  return statSync(buildId).mtimeMs < newestSourceTime();
}

function banner(url) {
  const width = Math.max(...demoAccounts.map((a) => a.email.length));
  const lines = [
    '',
    `  Switchback is running at ${url}${dev ? '  (development mode)' : ''}`,
    '',
    `  Demo accounts (${demoGroup}, fictional):`,
    ...demoAccounts.map((a) => `    ${a.role.padEnd(9)} ${a.email.padEnd(width)}  ${a.password}`),
    '',
    process.env.DB_HOST ? '  Press Ctrl-C to stop the app (the existing MariaDB server keeps running).' : '  Press Ctrl-C to stop the app and its private MariaDB server.',
    '',
  ];
  console.log(lines.join('\n'));
}

async function main() {
  log(dev ? 'Starting in development mode.' : 'Starting.');
  const dbEnv = await startDatabase({ instance: 'app', log });
  // Precedence: the running database > the real environment > .env.local.
  const fileEnv = readEnvFile(path.join(ROOT, '.env.local'));
  const url = `http://127.0.0.1:${port}`;
  let env = { ...fileEnv, ...process.env, ...dbEnv, NEXT_TELEMETRY_DISABLED: '1', PORT: port };
  if (!process.env.DB_HOST) env.SWITCHBACK_PRIVATE_DB = '1'; // the children's DB_HOST is ours, not an existing server
  if (!process.env.NEXTAUTH_URL && (!fileEnv.NEXTAUTH_URL || fileEnv.NEXTAUTH_URL === 'http://127.0.0.1:3000')) {
    env.NEXTAUTH_URL = url; // follow PORT unless someone chose a different address on purpose
  }

  await step('Migrating the database ...', ['tsx', 'db/migrate.ts', 'up'], env);
  await step('Seeding demo data ...', ['tsx', 'db/seed.ts'], env);

  services = await startLocalServices(ROOT, env);
  env = { ...env, ...services.env };

  if (!dev && needsBuild()) {
    await step('Building the app (sources changed since the last build) ...', ['next', 'build'], env);
    writeFileSync(BUILD_MARK, 'FOR=app\n');
  }

  // Production: scripts/serve.mjs, Next plus the probe-items API answered directly (see DEVELOPERS.md).
  if (dev) {
    const args = ['next', 'dev', '-H', '127.0.0.1', '-p', port];
    log(`$ npx ${args.join(' ')}`);
    child = spawnNpx(args, { env });
  } else {
    const args = serverArgs(port);
    log(`$ node ${args.join(' ')}`);
    child = spawnNode(args, { env, cwd: ROOT });
  }
  const exited = waitForExit(child);
  exited.then((code) => {
    if (!shuttingDown) log(`The app exited (${code}).`);
    shutdown(code === 0 ? 0 : 1);
  });
  await waitForHttp(`${url}/api/health`, { timeoutMs: 180_000, child });
  banner(url);
}

main().catch((error) => {
  console.error(`[switchback] ${error.message}`);
  shutdown(1);
});
