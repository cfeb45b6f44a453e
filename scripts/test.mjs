// `npm test`: lint, typecheck, unit and integration tests against a private MariaDB (port 3308) and
// a private Redis (TEST_REDIS_PORT, default 6380; for the scale-out tests, passed as TEST_REDIS_URL), then browser tests against a production build on 127.0.0.1:$TEST_PORT (3100).
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
import { parseArgs } from 'node:util';
import { startDatabase, stopDatabase } from './mariadb.mjs';
import { startRedis, stopRedis } from './redis.mjs';
import { closingLines, countTests } from './test-report.mjs';
import { ensureChromium, serverArgs, spawnNode, spawnNpx, startLocalServices, stopChild, waitForExit, waitForHttp } from './system.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const ARTIFACTS = path.join(ROOT, 'tests', 'artifacts');
const SERVER_LOG = path.join(ARTIFACTS, 'next-server.log');
const MODES = ['all', 'unit', 'integration', 'browser'];
const TEST_DIST_DIR = process.env.TEST_NEXT_DIST_DIR || '.next-test';
const VITEST_JSON = path.join(ARTIFACTS, 'vitest-report.json');
const PLAYWRIGHT_JSON = path.join(ARTIFACTS, 'playwright-report.json');
const VITEST_REPORT = ['--reporter=default', '--reporter=json', `--outputFile.json=${VITEST_JSON}`];

/** A JSON report of this run, or null when its tool did not run. */
function readReport(file) {
  try {
    return JSON.parse(readFileSync(file, 'utf8'));
  } catch {
    return null;
  }
}

function commandLine(argv) {
  const usage = 'usage: node scripts/test.mjs [--only unit|integration|browser [-- extra args]]';
  const { values, positionals, tokens } = parseArgs({ args: argv, options: { only: { type: 'string', default: 'all' } }, allowPositionals: true, tokens: true });
  // Extra arguments for vitest / playwright only after `--`.
  const terminator = tokens.find((t) => t.kind === 'option-terminator');
  const stray = tokens.some((t) => t.kind === 'positional' && (!terminator || t.index < terminator.index));
  const mode = values.only;
  if (stray || !MODES.includes(mode) || (mode === 'all' && positionals.length > 0)) throw new Error(usage);
  return { mode, extra: positionals };
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
  // The test build goes to a folder of its own (.next-test), so `npm test` and `npm start` never
  // rebuild each other's build (next.config.mjs reads NEXT_DIST_DIR).
  const base = { ...process.env, NEXT_DIST_DIR: TEST_DIST_DIR, NEXT_TELEMETRY_DISABLED: '1', PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD: '1' };
  delete base.NODE_ENV; // each tool picks its own (vitest: test, next build/start: production)
  delete base.REDIS_URL; // the tests choose per process whether the shared Redis is used (TEST_REDIS_URL)
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
      // The queue and shared-state tests start their worker and app processes against this one; the
      // app itself gets no REDIS_URL here, so every other test runs the in-process default.
      await step('test redis', async () => {
        const { REDIS_URL } = await startRedis({ instance: 'test', log: say });
        env = { ...env, TEST_REDIS_URL: REDIS_URL };
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
        // Marks a test build, which scripts/start.mjs never serves (should someone point both at one folder).
        writeFileSync(path.join(ROOT, TEST_DIST_DIR, 'SWITCHBACK_BUILD_FOR'), 'FOR=test\n');
      });
      await step('seed', () => npx(['tsx', 'db/seed.ts'], env));
      await step(`server on ${baseUrl}`, async () => {
        mkdirSync(ARTIFACTS, { recursive: true });
        const out = openSync(SERVER_LOG, 'w');
        // The production server (Next plus the probe-items API answered directly), as `npm start` runs it.
        server = spawnNode(serverArgs(port), { env, stdio: ['ignore', out, out], cwd: ROOT });
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
    if (needsDb) await stopRedis({ instance: 'test', log: say }).catch((error) => say(`stopping Redis failed: ${error.message}`));
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
  options = commandLine(process.argv.slice(2));
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
  // Behaviour tests and bad-input table rows apart, then the plain closing line CI reads: every
  // vitest and Playwright test of this run.
  for (const line of closingLines(countTests(readReport(VITEST_JSON), readReport(PLAYWRIGHT_JSON)))) console.log(line);
}
