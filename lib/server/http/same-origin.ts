import { configuredOrigin } from '@/lib/server/env';
import { ForbiddenError } from '@/lib/server/errors';

// Cross-site request forgery: a page on another port or subdomain of the same host is "same-site",
// so the browser sends it the session cookie (SameSite=Lax does not help), and a plain HTML form
// can post to any route. Two checks close that, for every state-changing request a session cookie
// authorises:
//   1. the request comes from this origin: the Origin header names this host (browsers send it on
//      every POST, PUT, PATCH and DELETE), or, without Origin, Sec-Fetch-Site says same-origin;
//   2. the body is declared as JSON (or the route's upload type). A form can only send
//      application/x-www-form-urlencoded, multipart/form-data or text/plain, and a cross-origin
//      fetch with another type needs a CORS preflight this app never grants.
// API-key routes (/api/v1) are called by survey software from anywhere and are exempt: they
// carry a key, not a cookie.

/** Methods that change state and therefore need the checks. */
const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** Paths answered with an API key instead of a session cookie. */
export function isApiKeyPath(pathname: string): boolean {
  return pathname === '/api/v1' || pathname.startsWith('/api/v1/');
}

/** Whether `method` changes state (and so needs the cross-site checks). */
export function isStateChanging(method: string): boolean {
  return STATE_CHANGING.has(method.toUpperCase());
}

/** The media type of a Content-Type header, lower case and without parameters ('' when absent). */
export function mediaType(contentType: string | null): string {
  return (contentType ?? '').split(';')[0]!.trim().toLowerCase();
}

/**
 * Whether the request was sent by a page of this app: Origin equal to this server's own origin
 * (the Host the browser addressed, or the configured NEXTAUTH_URL), or no Origin and
 * `Sec-Fetch-Site: same-origin`. Another port or subdomain is another origin and is refused.
 */
export function isSameOrigin(request: Request, ownUrl: URL): boolean {
  const origin = request.headers.get('origin');
  if (origin === null) return request.headers.get('sec-fetch-site') === 'same-origin';
  let parsed: URL;
  try {
    parsed = new URL(origin);
  } catch {
    return false; // "null" (sandboxed frames, file: pages) and anything unparsable
  }
  if (parsed.origin === configuredOrigin()) return true;
  const host = request.headers.get('host') ?? ownUrl.host;
  return (parsed.protocol === 'http:' || parsed.protocol === 'https:') && parsed.host === host.toLowerCase();
}

export const CROSS_SITE_MESSAGE = 'This request did not come from a Switchback page, so it was refused (cross-site protection).';

/**
 * Refuses (403, JSON error) a state-changing request that a cross-site page could have sent: not
 * from this origin, or with a body type other than `application/json` or one of `bodyTypes`.
 * Safe methods and API-key paths pass untouched.
 */
export function assertSameOriginWrite(request: Request, ownUrl: URL, bodyTypes: readonly string[] = ['application/json']): void {
  if (!isStateChanging(request.method) || isApiKeyPath(ownUrl.pathname)) return;
  if (!isSameOrigin(request, ownUrl)) throw new ForbiddenError(CROSS_SITE_MESSAGE);
  const type = mediaType(request.headers.get('content-type'));
  if (!bodyTypes.includes(type)) {
    throw new ForbiddenError(`${CROSS_SITE_MESSAGE} Send the body as ${bodyTypes.join(' or ')}.`);
  }
}
