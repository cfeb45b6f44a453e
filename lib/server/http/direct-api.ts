import type { IncomingMessage, ServerResponse } from 'node:http';
import { ApiError } from '@/lib/server/errors';
import { errorReply, type PlainReply } from '@/lib/server/http/error-reply';
import { BODY_TOO_LARGE, MAX_BODY_BYTES } from '@/lib/server/http/read-json';
import { handleProbeItems } from '@/lib/server/http/probe-endpoint';

// The production server (scripts/serve.mjs) answers POST /api/v1/studies/{id}/probe-items here,
// on node:http, instead of handing it to Next: the survey-facing hot path is measured in
// `npm run bench:api`, and Next's own request handling alone costs more than the endpoint.
// Everything else goes to Next. This is the only route answered outside Next; the logic is
// `handleProbeItems`, the same function the Next route (dev mode, tests) calls.

const PROBE_PATH = /^\/api\/v1\/studies\/([^/]+)\/probe-items$/;

/** The header that says a reply came from this direct path rather than through Next. */
export const DIRECT_PATH_HEADER = 'x-switchback-path';

/** The study id segment when `method url` is the probe-items endpoint, else null. */
export function probeItemsStudyId(method: string | undefined, url: string | undefined): string | null {
  if (method !== 'POST' || !url) return null;
  const query = url.indexOf('?');
  const match = PROBE_PATH.exec(query === -1 ? url : url.slice(0, query));
  if (!match) return null;
  try {
    return decodeURIComponent(match[1]);
  } catch {
    return null; // malformed escapes: Next answers those as it always did
  }
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

/** Answers the request when it is the probe-items endpoint (true), else leaves it alone (false). */
export function answerDirect(request: IncomingMessage, response: ServerResponse): boolean {
  const studyId = probeItemsStudyId(request.method, request.url);
  if (studyId === null) return false;
  const authorization = request.headers.authorization;
  handleProbeItems({ studyId, authorization: authorization === undefined ? null : authorization, readBody: () => readNodeBody(request) })
    .catch((error: unknown) => errorReply(error))
    .then((reply) => send(response, reply));
  return true;
}
