import { NextResponse, type NextRequest } from 'next/server';
import { errorReply, type PlainReply } from './error-reply';

export type RouteContext<P extends Record<string, string> = Record<string, string>> = { params: Promise<P> };

/** A plain reply (status, headers, body text) as a NextResponse. */
export function toNextResponse(reply: PlainReply): NextResponse {
  return new NextResponse(reply.body, { status: reply.status, headers: reply.headers });
}

/** Errors as replies, through the one mapping in `errorReply` (lib/server/http/error-reply.ts). */
export function errorResponse(error: unknown): NextResponse {
  return toNextResponse(errorReply(error));
}

/** Wraps a route handler so every thrown error is answered by `errorResponse`. */
export function route<P extends Record<string, string>>(
  handler: (request: NextRequest, context: RouteContext<P>) => Promise<Response>,
) {
  return async (request: NextRequest, context: RouteContext<P>): Promise<Response> => {
    try {
      return await handler(request, context);
    } catch (error) {
      return errorResponse(error);
    }
  };
}
