import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireUser } from '@/lib/server/auth/session';
import { acceptInvitation } from '@/lib/server/services/invitations';
import { acceptInvitationSchema } from '@/lib/shared/validations/team';

/** Accepts an invitation for the signed-in user (whose address must be the invited one). */
export const POST = route(async (request) => {
  const user = await requireUser(request);
  const { token } = await readJson(request, acceptInvitationSchema);
  return NextResponse.json(await acceptInvitation(user, token));
});
