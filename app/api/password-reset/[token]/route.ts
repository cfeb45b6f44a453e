import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { describeResetLink } from '@/lib/server/services/password-reset';

/** Whether a reset link can still be used, and if not, why (for the reset page). */
export const GET = route<{ token: string }>(async (_request, { params }) => {
  const link = await describeResetLink((await params).token);
  return NextResponse.json(link, { headers: { 'Cache-Control': 'no-store', 'Referrer-Policy': 'no-referrer' } });
});
