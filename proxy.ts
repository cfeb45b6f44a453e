import { NextResponse, type NextRequest } from 'next/server';
import {
  DATA_POLICY,
  MALFORMED_PATH_MESSAGE,
  baseSecurityHeaders,
  hasMalformedEscape,
  isHttps,
  pagePolicy,
} from '@/lib/server/http/security-headers';

/**
 * Runs before every page and API route: refuses paths with malformed percent-escapes (400), and
 * sets the security headers, with a fresh script nonce per page request (Next reads the policy
 * from the request headers and puts the nonce on its own scripts).
 */
export function proxy(request: NextRequest) {
  const https = isHttps(request.nextUrl.protocol, request.headers.get('x-forwarded-proto'));
  const base = baseSecurityHeaders({ https });
  const api = request.nextUrl.pathname.startsWith('/api/');
  if (hasMalformedEscape(request.nextUrl.pathname)) {
    const headers = { ...base, 'Content-Security-Policy': DATA_POLICY };
    return api
      ? NextResponse.json({ error: MALFORMED_PATH_MESSAGE }, { status: 400, headers })
      : new NextResponse(MALFORMED_PATH_MESSAGE, { status: 400, headers: { ...headers, 'Content-Type': 'text/plain; charset=utf-8' } });
  }
  let response: NextResponse;
  let policy: string;
  if (api) {
    policy = DATA_POLICY;
    response = NextResponse.next();
  } else {
    const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(18))).toString('base64');
    policy = pagePolicy(nonce, { dev: process.env.NODE_ENV === 'development', https });
    const requestHeaders = new Headers(request.headers);
    requestHeaders.set('x-nonce', nonce);
    requestHeaders.set('Content-Security-Policy', policy);
    response = NextResponse.next({ request: { headers: requestHeaders } });
  }
  response.headers.set('Content-Security-Policy', policy);
  for (const [name, value] of Object.entries(base)) response.headers.set(name, value);
  return response;
}

export const config = {
  // Hashed build assets are served as they are (nosniff comes from next.config.mjs).
  matcher: ['/((?!_next/static|_next/image).*)'],
};
