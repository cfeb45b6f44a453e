import { NextResponse, type NextRequest } from 'next/server';
import { clientAddress } from '@/lib/server/auth/client-address';
import { ApiError } from '@/lib/server/errors';
import { errorResponse } from '@/lib/server/http/handler';
import { isHttps } from '@/lib/server/http/security-headers';
import { KeyRateLimiter } from '@/lib/server/http/key-rate-limit';
import { probeApiEnv } from '@/lib/server/env';
import { StepConflictError } from '@/lib/server/services/session-page/session-page';
import type { PageState } from '@/lib/shared/session-page';

// The participant-facing session page's API is public (participants have no account), so it
// protects itself: a rate limit per address and link; the participant's session token only in an
// httpOnly, SameSite=Strict cookie scoped to the link's API path (only its hash is stored); every
// write through `route()` (this origin and a JSON body, or 403); the participant id repeated in
// each request and checked against the token; no reply names another participant's data.

/**
 * Requests per client address and link: bursts of SESSION_PAGE_BURST (120), then
 * SESSION_PAGE_PER_SECOND (10) a second (a person answers far slower). With REDIS_URL the budget
 * is kept in Redis, so it holds however the requests are spread over app processes.
 */
export const pageRateLimiter = new KeyRateLimiter(probeApiEnv().SESSION_PAGE_BURST, probeApiEnv().SESSION_PAGE_PER_SECOND, undefined, 'page');

export const SESSION_COOKIE = 'sb_session';

/** 429 with Retry-After when this address has used its budget for the link (503 while REDIS_URL's Redis is unreachable). */
export async function takePageBudget(request: NextRequest, slug: string): Promise<void> {
  const wait = await pageRateLimiter.takeShared(`${clientAddress(request.headers)}:${slug}`);
  if (wait > 0) throw Object.assign(new ApiError(429, `Too many requests; please wait ${wait} s.`), { retryAfter: wait });
}

/** The session token of this link's cookie, or null. */
export function sessionTokenOf(request: NextRequest): string | null {
  return request.cookies.get(SESSION_COOKIE)?.value ?? null;
}

/** A page state as the reply, setting the session cookie when a token was issued; never cached. */
export function pageReply(request: NextRequest, slug: string, state: PageState, token: string | null = null, status = 200): NextResponse {
  const response = NextResponse.json(state, { status, headers: { 'Cache-Control': 'no-store' } });
  if (token) {
    response.cookies.set(SESSION_COOKIE, token, {
      httpOnly: true,
      sameSite: 'strict',
      secure: isHttps(request.nextUrl.protocol, request.headers.get('x-forwarded-proto')),
      path: `/api/session-page/${slug}`,
      maxAge: 30 * 24 * 3600,
    });
  }
  return response;
}

/** Errors of the page's API: a refused step carries the step to show instead; a 429 its Retry-After. */
export function pageErrorResponse(error: unknown): NextResponse {
  if (error instanceof StepConflictError) {
    return NextResponse.json({ error: error.message, state: error.state }, { status: 409, headers: { 'Cache-Control': 'no-store' } });
  }
  const response = errorResponse(error);
  const retryAfter = (error as { retryAfter?: number }).retryAfter;
  if (retryAfter) response.headers.set('Retry-After', String(retryAfter));
  response.headers.set('Cache-Control', 'no-store');
  return response;
}
