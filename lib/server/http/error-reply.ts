import { randomUUID } from 'node:crypto';
import { ZodError } from 'zod';
import { ApiError, ServiceUnavailableError } from '@/lib/server/errors';
import { isDatabaseUnavailable } from '@/lib/server/http/db-errors';

/** An HTTP reply as plain data, for code that answers outside Next (scripts/serve.mjs). */
export type PlainReply = { status: number; headers: Record<string, string>; body: string };

/** A JSON reply as plain data. */
export function jsonReply(status: number, data: unknown, headers: Record<string, string> = {}): PlainReply {
  return { status, headers: { 'content-type': 'application/json', ...headers }, body: JSON.stringify(data) };
}

/** Issues of a ZodError as `{ path, message }` pairs, with dotted paths. */
export function zodIssues(error: ZodError) {
  return error.issues.map((issue) => ({ path: issue.path.map(String).join('.') || '(body)', message: issue.message }));
}

/**
 * The one place errors become statuses: ApiError → its status (a ServiceUnavailableError with
 * Retry-After); ZodError → 422; database down → 503 with Retry-After; other → 500 with a logged
 * reference and no internals.
 */
export function errorReply(error: unknown): PlainReply {
  if (error instanceof ApiError) {
    const headers: Record<string, string> = error instanceof ServiceUnavailableError ? { 'Retry-After': String(error.retryAfterS) } : {};
    return jsonReply(error.status, { error: error.message, ...(error.issues ? { issues: error.issues } : {}) }, headers);
  }
  if (error instanceof ZodError) {
    return jsonReply(422, { error: 'Some fields are invalid.', issues: zodIssues(error) });
  }
  if (isDatabaseUnavailable(error)) {
    return jsonReply(503, { error: 'database unavailable' }, { 'Retry-After': '5' });
  }
  const id = randomUUID();
  console.error(`[switchback] unexpected error ${id}:`, error);
  return jsonReply(500, { error: `Something went wrong on our side (reference ${id}).` });
}
