import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { NotFoundError } from '@/lib/server/errors';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { changeMemberRole, removeMember } from '@/lib/server/services/members';
import { parseRouteId } from '@/lib/server/route-ids';
import { memberRoleSchema } from '@/lib/shared/validations/team';

type Params = { id: string; userId: string };

function memberId(raw: string): number {
  const id = parseRouteId(raw);
  if (!id) throw new NotFoundError('This person is not a member of this study.');
  return id;
}

/** Changes a member's role (owners only; never the last owner's). */
export const PATCH = route<Params>(async (request, { params }) => {
  const { id, userId } = await params;
  const { user, study } = await requireRole(request, id, 'owner');
  const input = await readJson(request, memberRoleSchema);
  return NextResponse.json(await changeMemberRole(user.id, study.id, memberId(userId), input.role));
});

/** Removes a member: owners remove anyone, every member may leave; never the last owner. */
export const DELETE = route<Params>(async (request, { params }) => {
  const { id, userId } = await params;
  const { user, study, role } = await requireRole(request, id, 'viewer');
  await removeMember({ id: user.id, role }, study.id, memberId(userId));
  return new NextResponse(null, { status: 204 });
});
