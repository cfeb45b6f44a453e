import { NextResponse } from 'next/server';
import { route } from '@/lib/api/handler';
import { readJson } from '@/lib/api/read-json';
import { requireUser } from '@/lib/auth/session';
import { acceptInvitation } from '@/lib/services/invitations';
import { acceptInvitationSchema } from '@/lib/validations/team';

/** Accepts an invitation for the signed-in user (whose address must be the invited one). */
export const POST = route(async (request) => {
  const user = await requireUser(request);
  const { token } = await readJson(request, acceptInvitationSchema);
  return NextResponse.json(await acceptInvitation(user, token));
});
