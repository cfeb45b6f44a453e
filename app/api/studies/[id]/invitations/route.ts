import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { createInvitation, listInvitations } from '@/lib/server/services/invitations';
import { invitationSchema } from '@/lib/shared/validations/team';

type Params = { id: string };

export const GET = route<Params>(async (request, { params }) => {
  const { study } = await requireRole(request, (await params).id, 'owner');
  return NextResponse.json({ invitations: await listInvitations(study.id) });
});

export const POST = route<Params>(async (request, { params }) => {
  const { user, study } = await requireRole(request, (await params).id, 'owner');
  const input = await readJson(request, invitationSchema);
  return NextResponse.json(await createInvitation(user, study, input), { status: 201 });
});
