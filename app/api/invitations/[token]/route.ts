import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { describeInvitationLink } from '@/lib/server/services/invitations';

/**
 * What an invitation link leads to (study, role, address, or why it no longer works). Public: the
 * link's holder may not have an account yet. Only someone holding the token learns anything.
 */
export const GET = route<{ token: string }>(async (_request, { params }) => {
  const view = await describeInvitationLink((await params).token);
  return NextResponse.json({ view }, { headers: { 'Cache-Control': 'no-store', 'Referrer-Policy': 'no-referrer' } });
});
