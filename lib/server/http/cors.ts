import type { PlainReply } from '@/lib/server/http/error-reply';
import { allowedOriginsOfStudy, type CachedKey } from '@/lib/server/services/api-keys';

// Cross-origin access to the participant-session API (/api/v1). No cookies are involved (keys
// travel in the Authorization header), so credentials are never allowed and an origin is
// reflected only when a key lists it: the key of the request when it was recognised, else (a
// preflight, which carries no key, or a request refused before its key was read) any active key
// of the study. Every reply goes through here, errors and 429 included, on both the direct path
// and the Next routes, so a browser page can read why it was refused.

export const SESSION_TOKEN_HEADER = 'x-session-token';
const ALLOW_HEADERS = `Authorization, Content-Type, X-Session-Token`;
const EXPOSE_HEADERS = 'Retry-After, X-Switchback-Path';

/** Whether `origin` may read the reply: listed by the key, or by an active key of the study when no key was recognised. */
async function originAllowed(studyId: number | null, origin: string, key: CachedKey | null): Promise<boolean> {
  const normalised = origin.toLowerCase();
  if (key) return key.allowedOrigins.includes(normalised);
  if (studyId === null) return false;
  return (await allowedOriginsOfStudy(studyId)).has(normalised);
}

/** The reply with the CORS headers that fit the request's Origin (none without one: server-to-server calls pay nothing). */
export async function withCors(reply: PlainReply, studyId: number | null, origin: string | null, key: CachedKey | null): Promise<PlainReply> {
  if (!origin) return reply;
  const headers: Record<string, string> = { ...reply.headers, Vary: 'Origin' };
  let allowed = false;
  try {
    allowed = await originAllowed(studyId, origin, key);
  } catch {
    allowed = false; // the database is down: the reply (most likely a 503) goes out without them
  }
  if (allowed) {
    headers['Access-Control-Allow-Origin'] = origin;
    headers['Access-Control-Expose-Headers'] = EXPOSE_HEADERS;
  }
  return { ...reply, headers };
}

/** The answer to a preflight (OPTIONS) for a session endpoint of `studyId`. */
export async function preflightReply(studyId: number | null, origin: string | null, methods: string): Promise<PlainReply> {
  const reply: PlainReply = { status: 204, headers: { Allow: `${methods}, OPTIONS` }, body: '' };
  if (!origin) return reply;
  const cors = await withCors(reply, studyId, origin, null);
  if (!cors.headers['Access-Control-Allow-Origin']) return cors;
  return {
    ...cors,
    headers: { ...cors.headers, 'Access-Control-Allow-Methods': `${methods}, OPTIONS`, 'Access-Control-Allow-Headers': ALLOW_HEADERS, 'Access-Control-Max-Age': '600' },
  };
}
