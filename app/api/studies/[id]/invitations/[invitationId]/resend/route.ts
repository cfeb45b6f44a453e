import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { NotFoundError } from '@/lib/server/errors';
import { requireRole } from '@/lib/server/auth/session';
import { resendInvitation } from '@/lib/server/services/invitations';
import { parseRouteId } from '@/lib/server/route-ids';

/** Sends an open invitation again with a new link and a new 7-day expiry. */
export const POST = route<{ id: string; invitationId: string }>(async (request, { params }) => {
  const { id, invitationId } = await params;
  const { user, study } = await requireRole(request, id, 'owner');
  const invitation = parseRouteId(invitationId);
  if (!invitation) throw new NotFoundError('No open invitation with this id in this study.');
  return NextResponse.json(await resendInvitation(user, study, invitation));
});
