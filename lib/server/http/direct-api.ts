import type { IncomingMessage, ServerResponse } from 'node:http';
import { ApiError } from '@/lib/server/errors';
import { errorReply, type PlainReply } from '@/lib/server/http/error-reply';
import { BODY_TOO_LARGE, MAX_BODY_BYTES } from '@/lib/server/http/read-json';
import { handleProbeItems } from '@/lib/server/http/probe-endpoint';
import { preflightReply } from '@/lib/server/http/cors';
import { handleCalibration, handleStage2Answers, studyIdOf, type SessionCall } from '@/lib/server/http/session-endpoints';

// The production server (scripts/serve.mjs) answers the participant-session endpoints that lab
// software calls for every participant here, on node:http, instead of handing them to Next: the
// calibration block (GET), probe items and stage-2 answers (POST), and their CORS preflights
// (OPTIONS). Next's own request handling alone costs more than these endpoints (`npm run bench:api`).
// Everything else goes to Next. The logic is one framework-free function per endpoint, the same
// the Next routes (dev mode, tests) call.

const SESSION_PATH = /^\/api\/v1\/studies\/([^/]+)\/(probe-items|stage2-answers|calibration)$/;

/** The header that says a reply came from this direct path rather than through Next. */
export const DIRECT_PATH_HEADER = 'x-switchback-path';

type Endpoint = { method: 'GET' | 'POST'; handle: (call: SessionCall) => Promise<PlainReply> };
const ENDPOINTS: Record<string, Endpoint> = {
  'probe-items': { method: 'POST', handle: handleProbeItems },
  'stage2-answers': { method: 'POST', handle: handleStage2Answers },
  calibration: { method: 'GET', handle: handleCalibration },
};

/** The session endpoint, study id segment and query of `url`, else null. */
function sessionPath(url: string | undefined): { endpoint: string; studyId: string; query: string } | null {
  if (!url) return null;
  const q = url.indexOf('?');
  const match = SESSION_PATH.exec(q === -1 ? url : url.slice(0, q));
  if (!match) return null;
  try {
    return { studyId: decodeURIComponent(match[1]), endpoint: match[2], query: q === -1 ? '' : url.slice(q + 1) };
  } catch {
    return null; // malformed escapes: Next answers those as it always did
  }
}

/** The study id segment when `method url` is the probe-items endpoint, else null. */
export function probeItemsStudyId(method: string | undefined, url: string | undefined): string | null {
  const path = method === 'POST' ? sessionPath(url) : null;
  return path && path.endpoint === 'probe-items' ? path.studyId : null;
}

/**
 * Reads a Node request body as UTF-8 text, refusing more than `maxBytes` with 413 whether the
 * size is declared up front or only seen while streaming (as readBodyText does for a Request).
 */
export function readNodeBody(request: IncomingMessage, maxBytes = MAX_BODY_BYTES, tooBig = BODY_TOO_LARGE): Promise<string> {
  if (Number(request.headers['content-length'] ?? '0') > maxBytes) return Promise.reject(new ApiError(413, tooBig));
  if (request.destroyed) return Promise.reject(new ApiError(400, 'The request body was not received completely.'));
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    let settled = false;
    const settle = (outcome: () => void) => {
      if (settled) return;
      settled = true;
      outcome();
    };
    request.on('data', (chunk: Buffer) => {
      if (settled) return;
      size += chunk.byteLength;
      if (size > maxBytes) settle(() => reject(new ApiError(413, tooBig)));
      else chunks.push(chunk);
    });
    request.on('end', () => settle(() => resolve(Buffer.concat(chunks).toString('utf8'))));
    request.on('error', () => settle(() => reject(new ApiError(400, 'The request body was not received completely.'))));
    request.on('close', () => settle(() => reject(new ApiError(400, 'The request body was not received completely.'))));
  });
}

function send(response: ServerResponse, reply: PlainReply): void {
  if (response.headersSent || response.destroyed) return;
  const headers: Record<string, string | number> = { ...reply.headers, [DIRECT_PATH_HEADER]: 'direct', 'content-length': Buffer.byteLength(reply.body) };
  // A refused body may still be arriving: close the connection rather than read the rest.
  if (reply.status === 413) headers.connection = 'close';
  response.writeHead(reply.status, headers);
  response.end(reply.body);
}

const header = (request: IncomingMessage, name: string): string | null => {
  const value = request.headers[name];
  return typeof value === 'string' ? value : null;
};

/** Answers the request when it is a participant-session endpoint or its preflight (true), else leaves it alone (false). */
export function answerDirect(request: IncomingMessage, response: ServerResponse): boolean {
  const path = sessionPath(request.url);
  if (!path) return false;
  const endpoint = ENDPOINTS[path.endpoint];
  const origin = header(request, 'origin');
  let pending: Promise<PlainReply>;
  if (request.method === 'OPTIONS') {
    const studyId = studyIdOf(path.studyId);
    pending = preflightReply(studyId < 0 ? null : studyId, origin, endpoint.method);
  } else if (request.method === endpoint.method) {
    pending = endpoint.handle({
      studyId: path.studyId,
      authorization: header(request, 'authorization'),
      origin,
      sessionToken: header(request, 'x-session-token'),
      query: new URLSearchParams(path.query),
      readBody: () => readNodeBody(request),
    });
  } else {
    return false; // other methods: Next answers (405), as before
  }
  pending.catch((error: unknown) => errorReply(error)).then((reply) => send(response, reply));
  return true;
}
