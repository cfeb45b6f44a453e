import NextAuth from 'next-auth';
import type { NextRequest } from 'next/server';
import { authOptions } from '@/lib/server/auth/options';
import { ForbiddenError } from '@/lib/server/errors';
import { errorResponse } from '@/lib/server/http/handler';
import { CROSS_SITE_MESSAGE, isSameOrigin } from '@/lib/server/http/same-origin';

const handler = NextAuth(authOptions);

/**
 * next-auth's own POSTs (sign-in, sign-out) carry its double-submit CSRF token, but a page on
 * another port of the same host receives the same cookies and so could read that token from its
 * own requests. They are therefore also refused unless they come from this origin. They keep their
 * form body type (next-auth's client posts application/x-www-form-urlencoded), so only the origin
 * is checked here.
 */
async function POST(request: NextRequest, context: { params: Promise<{ nextauth: string[] }> }) {
  if (!isSameOrigin(request, new URL(request.url))) return errorResponse(new ForbiddenError(CROSS_SITE_MESSAGE));
  return handler(request, context);
}

export { handler as GET, POST };
