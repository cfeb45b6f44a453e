import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { probeApiDocument } from '@/lib/server/http/probe-api-openapi';

/** The OpenAPI 3.1 document of the probe-items API (public: it describes, it does not serve data). */
export const GET = route(async (request) => NextResponse.json(probeApiDocument(new URL(request.url).origin)));
