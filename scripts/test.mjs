// `npm test`: lint, typecheck, unit and integration tests against a private MariaDB (port 3308),
// then browser tests against a production build on 127.0.0.1:$TEST_PORT (3100).
//
//   node scripts/test.mjs                          everything, stopping at the first failure
//   node scripts/test.mjs --only unit              vitest unit project (no database)
//   node scripts/test.mjs --only integration       test database + vitest integration project
//   node scripts/test.mjs --only browser           test database + build + server + playwright
//   node scripts/test.mjs --only browser -- <args> extra arguments for vitest / playwright
//
// Whatever happens, the server, the local services and the test database are stopped at the end.
import { randomBytes } from 'node:crypto';
import { closeSync, existsSync, mkdirSync, openSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { startDatabase, stopDatabase } from './mariadb.mjs';
import { ensureChromium, spawnNode, spawnNpx, startLocalServices, stopChild, waitForExit, waitForHttp } from './system.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const ARTIFACTS = path.join(ROOT, 'tests', 'artifacts');
const SERVER_LOG = path.join(ARTIFACTS, 'next-server.log');
const MODES = ['all', 'unit', 'integration', 'browser'];
const VITEST_JSON = path.join(ARTIFACTS, 'vitest-report.json');
const PLAYWRIGHT_JSON = path.join(ARTIFACTS, 'playwright-report.json');
const VITEST_REPORT = ['--reporter=default', '--reporter=json', `--outputFile.json=${VITEST_JSON}`];

/** Adds up the machine-readable reports of this run into one closing count. */
function countTests() {
  let passedCount = 0;
  let failedCount = 0;
  let skipped = 0;
  try {
    const v = JSON.parse(readFileSync(VITEST_JSON, 'utf8'));
    passedCount += v.numPassedTests ?? 0;
    failedCount += v.numFailedTests ?? 0;
    skipped += (v.numPendingTests ?? 0) + (v.numTodoTests ?? 0);
  } catch {
    /* vitest did not run */
  }
  try {
    const p = JSON.parse(readFileSync(PLAYWRIGHT_JSON, 'utf8'));
    passedCount += (p.stats?.expected ?? 0) + (p.stats?.flaky ?? 0);
    failedCount += p.stats?.unexpected ?? 0;
    skipped += p.stats?.skipped ?? 0;
  } catch {
    /* playwright did not run */
  }
  return { passedCount, failedCount, skipped };
}

function parseArgs(argv) {
  const dashDash = argv.indexOf('--');
  const own = dashDash === -1 ? argv : argv.slice(0, dashDash);
  const extra = dashDash === -1 ? [] : argv.slice(dashDash + 1);
  let mode = 'all';
  for (let i = 0; i < own.length; i++) {
    if (own[i] === '--only') mode = own[++i];
    else if (own[i].startsWith('--only=')) mode = own[i].slice('--only='.length);
    else throw new Error(`unknown option ${own[i]}`);
  }
  if (!MODES.includes(mode) || (mode === 'all' && extra.length > 0)) {
    throw new Error('usage: node scripts/test.mjs [--only unit|integration|browser [-- extra args]]');
  }
  return { mode, extra };
}

const say = (message) => console.log(`[test] ${message}`);
const seconds = (ms) => `${(ms / 1000).toFixed(1)} s`;
const passed = [];
let current = null; // the running child, so a signal can stop it
let interrupted = false;

/** Runs one named step and records it; throws (with the step's name) on failure. */
async function step(name, fn) {
  if (interrupted) throw new Error('interrupted');
  say(`=== ${name}`);
  const started = Date.now();
  try {
    await fn();
  } catch (error) {
    error.step ??= name;
    throw error;
  }
  passed.push(name);
  say(`--- ${name} passed (${seconds(Date.now() - started)})`);
}

/** `npx <args>` with inherited output; rejects unless it exits 0. */
async function npx(args, env) {
  say(`$ npx ${args.join(' ')}`);
  current = spawnNpx(args, { env });
  const code = await waitForExit(current);
  current = null;
  if (interrupted) throw new Error('interrupted');
  if (code !== 0) throw new Error(`npx ${args.join(' ')} exited with ${code}`);
}

function tail(file, lines = 60) {
  try {
    return readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '(no output)';
  }
}

async function main({ mode, extra }) {
  const needsDb = mode !== 'unit';
  const port = process.env.TEST_PORT || '3100';
  const baseUrl = `http://127.0.0.1:${port}`;
  const base = { ...process.env, NEXT_TELEMETRY_DISABLED: '1', PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD: '1' };
  delete base.NODE_ENV; // each tool picks its own (vitest: test, next build/start: production)
  let env = base;
  let server = null;
  let services = null;

  try {
    if (mode === 'all') {
      await step('lint', async () => {
        await npx(['eslint', '.'], env);
        await npx(['depcruise', '--config', '.dependency-cruiser.cjs', '.'], env); // architecture boundaries (npm run lint:boundaries)
      });
      await step('typecheck', () => npx(['tsc', '--noEmit'], env));
    }
    if (mode === 'unit') {
      await step('unit tests', () => npx(['vitest', 'run', '--project', 'unit', ...extra], env));
      return;
    }
    if (needsDb) {
      await step('test database', async () => {
        const dbEnv = await startDatabase({ instance: 'test', fresh: true, log: say });
        env = {
          ...base,
          ...dbEnv,
          // Integration tests may stop and start this server through scripts/mariadb.mjs; same port then.
          TEST_DB_PORT: dbEnv.DB_PORT,
          NEXTAUTH_SECRET: randomBytes(32).toString('base64url'),
          NEXTAUTH_URL: baseUrl,
          BASE_URL: baseUrl,
          SWITCHBACK_TEST: '1',
        };
      });
      await step('local services', async () => {
        services = await startLocalServices(ROOT, env);
        env = { ...env, ...services.env };
      });
      await step('migrations', () => npx(['tsx', 'db/migrate.ts', 'up'], env));
    }
    if (mode === 'all') await step('vitest (unit + integration)', () => npx(['vitest', 'run', ...VITEST_REPORT], env));
    if (mode === 'integration') {
      await step('integration tests', () => npx(['vitest', 'run', '--project', 'integration', ...extra], env));
    }
    if (mode === 'all' || mode === 'browser') {
      if (mode === 'all') {
        // Integration tests may have stopped the server or left rows behind: start clean.
        await step('fresh test database', async () => {
          await startDatabase({ instance: 'test', fresh: true, log: say });
          await npx(['tsx', 'db/migrate.ts', 'up'], env);
        });
      }
      await step('chromium', () => ensureChromium({ log: say }));
      await step('build', async () => {
        await npx(['next', 'build'], env);
        // Tells scripts/start.mjs that the build folder holds a test build, which it must not serve.
        writeFileSync(path.join(ROOT, process.env.NEXT_DIST_DIR || '.next', 'SWITCHBACK_BUILD_FOR'), 'FOR=test\n');
      });
      await step('seed', () => npx(['tsx', 'db/seed.ts'], env));
      await step(`server on ${baseUrl}`, async () => {
        mkdirSync(ARTIFACTS, { recursive: true });
        const out = openSync(SERVER_LOG, 'w');
        // The production server (Next plus the probe-items API answered directly), as `npm start` runs it.
        server = spawnNode(['scripts/serve.mjs', '-H', '127.0.0.1', '-p', port], { env, stdio: ['ignore', out, out], cwd: ROOT });
        closeSync(out);
        say(`server output: ${path.relative(ROOT, SERVER_LOG)}`);
        try {
          await waitForHttp(`${baseUrl}/api/health`, { timeoutMs: 120_000, okOnly: true, child: server });
        } catch (error) {
          console.log(tail(SERVER_LOG));
          throw error;
        }
      });
      await step('browser tests', async () => {
        try {
          await npx(['playwright', 'test', '--reporter=list,json', ...extra], { ...env, PLAYWRIGHT_JSON_OUTPUT_NAME: PLAYWRIGHT_JSON });
        } catch (error) {
          say(`last lines of ${path.relative(ROOT, SERVER_LOG)}:`);
          console.log(tail(SERVER_LOG, 40));
          throw error;
        }
      });
    }
  } finally {
    if (server) await stopChild(server);
    if (services) await services.stop().catch((error) => say(`stopping local services failed: ${error.message}`));
    if (needsDb) await stopDatabase({ instance: 'test', log: say }).catch((error) => say(`stopping MariaDB failed: ${error.message}`));
  }
}

process.on('SIGINT', () => interrupt(130));
process.on('SIGTERM', () => interrupt(143));
let interruptCode = 0;
function interrupt(code) {
  if (interrupted) return;
  interrupted = true;
  interruptCode = code;
  say('interrupted; cleaning up ...');
  if (current) stopChild(current);
}

const started = Date.now();
let options;
try {
  options = parseArgs(process.argv.slice(2));
} catch (error) {
  console.error(error.message);
  process.exit(2);
}
if (!existsSync(path.join(ROOT, 'node_modules'))) {
  console.error('node_modules is missing: run `npm ci` first.');
  process.exit(2);
}
for (const report of [VITEST_JSON, PLAYWRIGHT_JSON]) rmSync(report, { force: true });
try {
  await main(options);
  say(`SUMMARY: PASSED ${options.mode} in ${seconds(Date.now() - started)} (${passed.join(', ')})`);
} catch (error) {
  const where = error.step ? ` at "${error.step}"` : '';
  say(`SUMMARY: FAILED${where} after ${seconds(Date.now() - started)}: ${error.message}`);
  say(`passed before that: ${passed.join(', ') || 'nothing'}`);
  process.exitCode = interruptCode || 1;
}
if (options.mode === 'all') {
  const { passedCount, failedCount, skipped } = countTests();
  // The plain closing line CI reads: every vitest and Playwright test of this run.
  console.log(`Tests: ${passedCount} passed, ${failedCount} failed${skipped ? `, ${skipped} skipped` : ''}`);
}
