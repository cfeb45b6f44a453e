// The production server that scripts/start.mjs and scripts/test.mjs run instead of `next start`:
// the same Next app (`next({ dev: false })` over the build in .next, or NEXT_DIST_DIR), on one
// node:http server, except that the participant-session endpoints (GET …/calibration, POST
// …/probe-items, POST …/stage2-answers under /api/v1/studies/{id}/, and their OPTIONS preflights)
// are answered directly by lib/server/http/direct-api.ts (the survey-facing hot path; Next's own request
// handling costs more than the endpoints). Everything else, their other methods included, goes to Next.
//
//   node scripts/serve.mjs [-H 127.0.0.1] [-p 3000]      (the port defaults to PORT, else 3000)
//
// SIGTERM or SIGINT closes the listener and Next, then exits.
import { createServer } from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { announcePeerStamping, stampPeerAddress } from './peer-address.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

// usage: node scripts/serve.mjs [-H host] [-p port]
const { values: options } = parseArgs({
  options: { hostname: { type: 'string', short: 'H', default: '127.0.0.1' }, port: { type: 'string', short: 'p', default: process.env.PORT || '3000' } },
});
const { hostname } = options;
const port = Number(options.port);
// As `next start` does: this server only ever serves a production build.
process.env.NODE_ENV = 'production';

const { default: next } = await import('next');
const app = next({ dev: false, dir: ROOT, hostname, port });
const handle = app.getRequestHandler();
await app.prepare(); // runs instrumentation.ts's register(), as `next start` does
// Loaded through tsx (the `@/` alias resolves from tsconfig.json): a module copy of its own beside
// Next's bundle, sharing the Sequelize pool and the API-key cache through globalThis.
const { tsImport } = await import('tsx/esm/api');
const { answerDirect } = await tsImport('../lib/server/http/direct-api.ts', import.meta.url);

// Rate limits count the connection's address, which Next's route handlers cannot see: it is handed
// over in a header of our own that no client can set (scripts/peer-address.mjs).
announcePeerStamping();

const server = createServer((request, response) => {
  stampPeerAddress(request);
  if (answerDirect(request, response)) return;
  handle(request, response);
});

let closing = null;
function close(code) {
  closing ??= (async () => {
    const forced = setTimeout(() => process.exit(code), 5_000);
    forced.unref();
    await new Promise((resolve) => server.close(() => resolve()));
    await app.close().catch(() => {});
    process.exit(code);
  })();
  server.closeIdleConnections?.();
}
process.on('SIGTERM', () => close(0));
process.on('SIGINT', () => close(0));

server.on('error', (error) => {
  console.error(`[switchback] the server could not listen on ${hostname}:${port}: ${error.message}`);
  process.exit(1);
});
server.listen(port, hostname, () => {
  console.log(`[switchback] serving ${path.relative(process.cwd(), ROOT) || '.'} on http://${hostname}:${port} (participant-session API answered directly)`);
});
