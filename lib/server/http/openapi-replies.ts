// Pieces every path of the session API's OpenAPI document shares: the study id parameter, the
// browser key's session-token header, the CORS preflight and the error replies, so each status is
// described once (probe-api-openapi.ts and session-openapi.ts build their paths from them).

/** The error body every endpoint sends: `error`, and `issues` naming the fields where there are any. */
export const errorBody = { $ref: '#/components/schemas/Error' };

/** The `content` of an error reply with an example message. */
export function errorContent(example: string) {
  return { 'application/json': { schema: errorBody, example: { error: example } } };
}

export const studyIdParameter = { name: 'id', in: 'path', required: true, schema: { type: 'integer' }, description: 'study id' };

export const sessionTokenHeader = {
  name: 'X-Session-Token',
  in: 'header',
  required: false,
  schema: { type: 'string' },
  description: 'Browser keys only: the participant\'s session token, returned once by the calibration call that started their session. Server keys do not send it.',
};

/** The CORS preflight (OPTIONS) of a path. */
export function preflight(operationId: string) {
  return { operationId, summary: 'CORS preflight', parameters: [studyIdParameter], responses: { '204': { description: 'allowed methods and headers for a listed origin' } }, security: [] };
}

/** An error status's meaning on one endpoint and an example of its message. */
export type ErrorReply = { description: string; example: string };

// what the statuses mean wherever an endpoint does not say otherwise
const COMMON: Record<string, ErrorReply> = {
  '400': { description: 'the body is not JSON', example: 'The request body is not valid JSON.' },
  '401': { description: 'missing, unknown or revoked key', example: 'This API key is unknown or has been revoked.' },
  '403': {
    description: 'browser key: origin not listed, or the participant\'s session token missing or wrong',
    example: "Send participant P-017's session token (X-Session-Token, from the calibration reply that started the session).",
  },
  '404': { description: 'the key belongs to another study', example: 'Study not found.' },
  '413': { description: 'body over 1 MB', example: 'The request body is larger than 1 MB.' },
  '429': { description: 'rate limit of the key', example: 'Too many requests for this key; retry in 2 s.' },
  '503': {
    description: 'the shared state store (Redis) of a multi-process server cannot be reached just now; nothing was recorded; retry after Retry-After',
    example: 'The shared state store (Redis) of this server cannot be reached just now; nothing was recorded. Retry shortly.',
  },
};

/** The error statuses of an endpoint that reads a JSON body from a key holder (probe items, stage-2 answers, adaptive steps). */
export const BODY_ENDPOINT_ERRORS = ['400', '401', '403', '404', '409', '413', '422', '429', '503'] as const;

// statuses whose reply says when to try again
const RETRY_AFTER = new Set(['429', '503']);

/**
 * The error replies of an endpoint, in the order given: each status as `own` describes it on this
 * endpoint, else as COMMON does (a status in neither is a mistake in the document and throws).
 */
export function errorReplies(statuses: readonly string[], own: Record<string, ErrorReply> = {}) {
  return Object.fromEntries(
    statuses.map((status) => {
      const reply = own[status] ?? COMMON[status];
      if (!reply) throw new Error(`OpenAPI: no description of status ${status}`);
      const headers = RETRY_AFTER.has(status) ? { headers: { 'Retry-After': { schema: { type: 'integer' } } } } : {};
      return [status, { description: reply.description, ...headers, content: errorContent(reply.example) }];
    }),
  );
}
