// A second (or third) app process for the scale-out tests: it answers the participant-session API
// exactly as scripts/serve.mjs does in production (lib/server/http/direct-api.ts over node:http),
// and GET requests of the session page's API through its Next route handler, against the test
// MariaDB and whatever REDIS_URL its environment names. It listens on a free port of loopback and
// prints it.
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { NextRequest } from 'next/server';
import { GET as sessionPage } from '@/app/api/session-page/[slug]/route';
import { answerDirect } from '@/lib/server/http/direct-api';

const SESSION_PAGE = /^\/api\/session-page\/([^/?]+)/;

const server = createServer((request, response) => {
  if (answerDirect(request, response)) return;
  const page = request.method === 'GET' ? SESSION_PAGE.exec(request.url ?? '') : null;
  if (!page) return void response.writeHead(404).end();
  const headers = new Headers();
  for (const [name, value] of Object.entries(request.headers)) if (typeof value === 'string') headers.set(name, value);
  const next = new NextRequest(`http://${request.headers.host ?? '127.0.0.1'}${request.url}`, { method: 'GET', headers });
  sessionPage(next, { params: Promise.resolve({ slug: decodeURIComponent(page[1]) }) })
    .then(async (reply) => {
      response.writeHead(reply.status, Object.fromEntries(reply.headers));
      response.end(Buffer.from(await reply.arrayBuffer()));
    })
    .catch(() => response.writeHead(500).end());
});
server.listen(0, '127.0.0.1', () => console.log(`session app listening on port ${(server.address() as AddressInfo).port}`));
process.on('SIGTERM', () => server.close(() => process.exit(0)));
