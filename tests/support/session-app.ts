// A second (or third) app process for the scale-out tests: it answers the participant-session API
// exactly as scripts/serve.mjs does in production (lib/server/http/direct-api.ts over node:http),
// against the test MariaDB and whatever REDIS_URL its environment names. It listens on a free port
// of loopback and prints it.
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { answerDirect } from '@/lib/server/http/direct-api';

const server = createServer((request, response) => {
  if (!answerDirect(request, response)) response.writeHead(404).end();
});
server.listen(0, '127.0.0.1', () => console.log(`session app listening on port ${(server.address() as AddressInfo).port}`));
process.on('SIGTERM', () => server.close(() => process.exit(0)));
