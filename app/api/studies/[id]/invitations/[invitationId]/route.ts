import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { NotFoundError } from '@/lib/server/errors';
import { requireRole } from '@/lib/server/auth/session';
import { revokeInvitation } from '@/lib/server/services/invitations';
import { parseRouteId } from '@/lib/server/route-ids';

/** Withdraws an open invitation (its link then says so). */
export const DELETE = route<{ id: string; invitationId: string }>(async (request, { params }) => {
  const { id, invitationId } = await params;
  const { user, study } = await requireRole(request, id, 'owner');
  const invitation = parseRouteId(invitationId);
  if (!invitation) throw new NotFoundError('No open invitation with this id in this study.');
  await revokeInvitation(user.id, study.id, invitation);
  return new NextResponse(null, { status: 204 });
});
