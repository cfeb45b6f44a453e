import { randomUUID } from 'node:crypto';
import { NextResponse, type NextRequest } from 'next/server';
import { ZodError } from 'zod';
import { ApiError } from './errors';
import { isDatabaseUnavailable } from '@/lib/server/db-errors';

export type RouteContext<P extends Record<string, string> = Record<string, string>> = { params: Promise<P> };

/** Issues of a ZodError as `{ path, message }` pairs, with dotted paths. */
export function zodIssues(error: ZodError) {
  return error.issues.map((issue) => ({ path: issue.path.map(String).join('.') || '(body)', message: issue.message }));
}

/** The one place errors become statuses: ApiError → its status; ZodError → 422; database down → 503; other → 500. */
export function errorResponse(error: unknown): NextResponse {
  if (error instanceof ApiError) {
    return NextResponse.json({ error: error.message, ...(error.issues ? { issues: error.issues } : {}) }, { status: error.status });
  }
  if (error instanceof ZodError) {
    return NextResponse.json({ error: 'Some fields are invalid.', issues: zodIssues(error) }, { status: 422 });
  }
  if (isDatabaseUnavailable(error)) {
    return NextResponse.json({ error: 'database unavailable' }, { status: 503, headers: { 'Retry-After': '5' } });
  }
  const id = randomUUID();
  console.error(`[switchback] unexpected error ${id}:`, error);
  return NextResponse.json({ error: `Something went wrong on our side (reference ${id}).` }, { status: 500 });
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
