// `npm run bench:api`: load test of the session API: POST /api/v1/studies/{id}/probe-items, then
// POST /api/v1/studies/{id}/stage2-answers.
//
// Needs: a running production server at BASE_URL (default http://127.0.0.1:3000, e.g. `npm start`)
// and its database (DB_* from the environment, else from .env.local as `npm start` writes it).
// Starts nothing itself. Through the database it creates a scratch study ("Bench · probe API …"),
// one frozen personalised design version, and 50 API keys (one per connection, so the per-key
// rate limit, 100 requests a second by default, is not what is measured), then runs autocannon
// with 50 connections for WARMUP seconds (default 2, not counted: the server's JIT settles),
// then for DURATION seconds (default 10), every request a distinct participant with its own
// calibration answers. Then the stage-2 answers endpoint the same way: every request one participant
// served in the first run, all their stage-2 answers (new records while unanswered participants
// last, idempotent replays after). Prints requests per second and p99 latency of each against the
// targets (≥ 2,500 req/s, p99 ≤ 40 ms). FLOOR=1 also loads the endpoint without a key (401 at
// once) to show what the server answers when the handler does nothing. The scratch study is
// deleted afterwards (KEEP=1 keeps it).
import autocannon from 'autocannon';
import { createHash, randomBytes } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { parseEnv } from 'node:util';
import * as mariadb from 'mariadb';
import { tsImport } from 'tsx/esm/api';

const BASE_URL = process.env.BASE_URL ?? 'http://127.0.0.1:3000';
const CONNECTIONS = 50;
const DURATION = Number(process.env.DURATION ?? 10);
const WARMUP = Number(process.env.WARMUP ?? 2);
const TARGET_RPS = 2500;
const TARGET_P99_MS = 40;
const ITEMS_PER_MAGNITUDE = 12;

function loadEnv() {
  const file = path.join(process.cwd(), '.env.local');
  if (!existsSync(file)) return;
  for (const [key, value] of Object.entries(parseEnv(readFileSync(file, 'utf8')))) {
    if (process.env[key] === undefined) process.env[key] = value;
  }
}

// The tests' frozen design (tests/support/frozen-design.ts) with a 12-item calibration block.
const { frozenDesign } = await tsImport('../tests/support/frozen-design.ts', import.meta.url);
const content = frozenDesign({ name: 'Bench personalised design', calibration: { itemsPerMagnitude: ITEMS_PER_MAGNITUDE, minDelay: 1, maxDelay: 180 } }, { name: 'Bench prior' });

/** Calibration answers of a consistent chooser: items are ordered by tie rate, so "sooner" up to a switch point, "later" after. */
function answers(n) {
  const switchSmall = 2 + (n % (ITEMS_PER_MAGNITUDE - 3));
  const switchLarge = 2 + ((n * 7) % (ITEMS_PER_MAGNITUDE - 3));
  const responses = {};
  for (let i = 1; i <= ITEMS_PER_MAGNITUDE; i++) {
    const id = String(i).padStart(2, '0');
    responses[`cal-small-${id}`] = i <= switchSmall ? 'sooner' : 'later';
    responses[`cal-large-${id}`] = i <= switchLarge ? 'sooner' : 'later';
  }
  return responses;
}

async function setUp(conn) {
  const { contentHash } = await tsImport('../lib/shared/canonical-json.ts', import.meta.url);
  const now = new Date();
  const label = `Bench · probe API ${now.toISOString()}`;
  const study = await conn.query('INSERT INTO studies (name, description, version, created_at, updated_at) VALUES (?, ?, 1, ?, ?)', [label, 'Scratch study of bench/api.mjs', now, now]);
  const studyId = Number(study.insertId);
  const design = await conn.query('INSERT INTO designs (study_id, name, spec, version, created_at, updated_at) VALUES (?, ?, ?, 1, ?, ?)', [studyId, content.spec.name, JSON.stringify(content.spec), now, now]);
  const version = await conn.query('INSERT INTO design_versions (design_id, study_id, number, hash, content, created_at) VALUES (?, ?, 1, ?, ?, ?)', [Number(design.insertId), studyId, contentHash(content), JSON.stringify(content), now]);
  const secrets = [];
  for (let i = 0; i < CONNECTIONS; i++) {
    const prefix = `sbk_${randomBytes(6).toString('base64url')}`;
    const secret = `${prefix}_${randomBytes(24).toString('base64url')}`;
    await conn.query('INSERT INTO api_keys (study_id, design_version_id, name, prefix, secret_hash, created_at) VALUES (?, ?, ?, ?, ?, ?)', [studyId, Number(version.insertId), `bench ${i}`, prefix, createHash('sha256').update(secret).digest('hex'), now]);
    secrets.push(secret);
  }
  return { studyId, secrets };
}

function report(title, result) {
  const rps = result.requests.average;
  const p99 = result.latency.p99;
  const bad = result.non2xx + result.errors + result.timeouts;
  console.log(title);
  console.log(`  requests per second: ${rps.toFixed(0)} (target ≥ ${TARGET_RPS}) ${rps >= TARGET_RPS ? 'met' : 'MISSED'}`);
  console.log(`  p99 latency: ${p99} ms (target ≤ ${TARGET_P99_MS} ms) ${p99 <= TARGET_P99_MS ? 'met' : 'MISSED'}`);
  console.log(`  p50 latency: ${result.latency.p50} ms; non-2xx, errors, timeouts: ${bad}`);
  if (bad > 0) process.exitCode = 1;
}

/** The stage-2 answers endpoint: the participants served above send all their stage-2 answers. */
async function loadStage2Answers(conn, studyId, secrets) {
  const rows = await conn.query("SELECT participant_id, JSON_EXTRACT(result, '$.items[*].id') AS ids FROM participants WHERE study_id = ? ORDER BY id", [studyId]);
  const bodies = rows.map((r, i) => {
    const ids = typeof r.ids === 'string' ? JSON.parse(r.ids) : r.ids;
    return JSON.stringify({ participantId: r.participant_id, answers: ids.map((itemId, j) => ({ itemId, chosen: (i + j) % 2 ? 'later' : 'sooner', responseTimeMs: 900 + ((i * 37 + j * 11) % 2000), sideShown: j % 2 ? 'left' : 'right' })) });
  });
  if (bodies.length === 0) throw new Error('no served participants to answer for');
  const url = `${BASE_URL}/api/v1/studies/${studyId}/stage2-answers`;
  let counter = 0;
  const load = (duration) =>
    autocannon({
      url,
      connections: CONNECTIONS,
      duration,
      requests: [
        {
          method: 'POST',
          setupRequest: (request) => {
            const n = counter++;
            return { ...request, headers: { authorization: `Bearer ${secrets[n % CONNECTIONS]}`, 'content-type': 'application/json' }, body: bodies[n % bodies.length] };
          },
        },
      ],
    });
  if (WARMUP > 0) await load(WARMUP);
  const result = await load(DURATION);
  report(`stage2-answers API, ${CONNECTIONS} connections, ${DURATION} s after a ${WARMUP} s warm-up, ${bodies.length} served participants (${counter > bodies.length ? 'new records, then idempotent replays' : 'new records only'})`, result);
}

async function main() {
  loadEnv();
  const conn = await mariadb.createConnection({ host: process.env.DB_HOST ?? '127.0.0.1', port: Number(process.env.DB_PORT ?? 3307), user: process.env.DB_USER, password: process.env.DB_PASSWORD, database: process.env.DB_NAME });
  const { studyId, secrets } = await setUp(conn);
  const url = `${BASE_URL}/api/v1/studies/${studyId}/probe-items`;
  try {
    const warm = await fetch(url, { method: 'POST', headers: { authorization: `Bearer ${secrets[0]}`, 'content-type': 'application/json' }, body: JSON.stringify({ participantId: 'warm-up', responses: answers(0) }) });
    if (warm.status !== 200) throw new Error(`warm-up request answered ${warm.status}: ${await warm.text()}`);
    let counter = 0;
    const load = (duration) =>
      autocannon({
        url,
        connections: CONNECTIONS,
        duration,
        requests: [
          {
            method: 'POST',
            setupRequest: (request) => {
              const n = ++counter;
              return {
                ...request,
                headers: { authorization: `Bearer ${secrets[n % CONNECTIONS]}`, 'content-type': 'application/json' },
                body: JSON.stringify({ participantId: `bench-${n}`, responses: answers(n) }),
              };
            },
          },
        ],
      });
    // A freshly started server compiles its hot paths during the first seconds; measure it warm.
    if (WARMUP > 0) await load(WARMUP);
    const result = await load(DURATION);
    report(`probe-items API, ${CONNECTIONS} connections, ${DURATION} s after a ${WARMUP} s warm-up, distinct participants`, result);
    await loadStage2Answers(conn, studyId, secrets);
    if (process.env.FLOOR) {
      // The same endpoint refusing a request without a key: Next's routing, request and reply
      // and nothing of ours, i.e. the most this server could answer on this machine right now.
      const floor = await autocannon({ url, connections: CONNECTIONS, duration: DURATION, method: 'POST', headers: { 'content-type': 'application/json' }, body: '{}' });
      console.log(`  floor (401 without a key, same connections): ${floor.requests.average.toFixed(0)} requests per second, p99 ${floor.latency.p99} ms`);
    }
  } finally {
    // Requests autocannon gave up on at the end may still be running on the server; deleting
    // their study under them would only fill the server's log with deadlocks.
    await new Promise((resolve) => setTimeout(resolve, 1000));
    if (!process.env.KEEP) {
      await conn.query('DELETE FROM studies WHERE id = ?', [studyId]);
      // InnoDB clears the deleted rows in the background, on the same cores the next run would use.
      console.log('Scratch study deleted; MariaDB purges its rows for several seconds: let it settle before running the benchmark again.');
    }
    await conn.end();
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
