import { NextResponse, type NextRequest } from 'next/server';
import { toNextResponse } from '@/lib/server/http/handler';
import { BODY_TOO_LARGE, MAX_BODY_BYTES, readBodyText } from '@/lib/server/http/read-json';
import type { SessionCall } from '@/lib/server/http/session-endpoints';
import { studyIdOf } from '@/lib/server/http/session-endpoints';
import { preflightReply } from './cors';
import type { PlainReply } from '@/lib/server/http/error-reply';

type Params = { params: Promise<{ id: string }> };

/**
 * A Next route handler over a framework-free session endpoint: the request becomes a SessionCall,
 * the plain reply a NextResponse. In production scripts/serve.mjs answers these paths with the same
 * functions directly; these adapters serve `next dev` and the tests.
 */
export function sessionRoute(handle: (call: SessionCall) => Promise<PlainReply>) {
  return async (request: NextRequest, { params }: Params): Promise<Response> => {
    const { id } = await params;
    const reply = await handle({
      studyId: id,
      authorization: request.headers.get('authorization'),
      origin: request.headers.get('origin'),
      sessionToken: request.headers.get('x-session-token'),
      query: new URL(request.url).searchParams,
      readBody: () => readBodyText(request, MAX_BODY_BYTES, BODY_TOO_LARGE),
    });
    return toNextResponse(reply);
  };
}

/** The CORS preflight of a session endpoint (OPTIONS). */
export function sessionPreflight(methods: 'GET' | 'POST') {
  return async (request: NextRequest, { params }: Params): Promise<Response> => {
    const { id } = await params;
    const studyId = studyIdOf(id);
    const reply = await preflightReply(studyId < 0 ? null : studyId, request.headers.get('origin'), methods);
    return new NextResponse(null, { status: reply.status, headers: reply.headers }); // a 204 has no body, not even an empty one
  };
}
