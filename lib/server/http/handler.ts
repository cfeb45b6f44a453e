import { NextResponse, type NextRequest } from 'next/server';
import { errorReply, type PlainReply } from './error-reply';
import { assertSameOriginWrite } from '@/lib/server/http/same-origin';

export type RouteContext<P extends Record<string, string> = Record<string, string>> = { params: Promise<P> };

/** A plain reply (status, headers, body text) as a NextResponse. */
export function toNextResponse(reply: PlainReply): NextResponse {
  return new NextResponse(reply.body, { status: reply.status, headers: reply.headers });
}

/** Errors as replies, through the one mapping in `errorReply` (lib/server/http/error-reply.ts). */
export function errorResponse(error: unknown): NextResponse {
  return toNextResponse(errorReply(error));
}

export type RouteOptions = {
  /** Body types a state-changing call may declare (an upload's type); JSON unless given. */
  bodyTypes?: readonly string[];
};

/**
 * Wraps a route handler so every thrown error is answered by `errorResponse`, and so every
 * state-changing call is refused (403) unless it comes from this origin with a JSON body (or one of
 * `bodyTypes`): the cross-site protection lives here, once, rather than in each route.
 */
export function route<P extends Record<string, string>>(
  handler: (request: NextRequest, context: RouteContext<P>) => Promise<Response>,
  options: RouteOptions = {},
) {
  const wrapped = async (request: NextRequest, context: RouteContext<P>): Promise<Response> => {
    try {
      assertSameOriginWrite(request, new URL(request.url), options.bodyTypes);
      return await handler(request, context);
    } catch (error) {
      return errorResponse(error);
    }
  };
  // Readable by the route-matrix test, which sends each route the body type it accepts.
  return Object.assign(wrapped, { bodyTypes: options.bodyTypes ?? ['application/json'] });
}
