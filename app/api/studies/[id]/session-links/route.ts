import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { createSessionLink, listSessionLinks } from '@/lib/server/services/session-links';
import { sessionLinkCreateSchema } from '@/lib/shared/validations/session-links';

/** The study's participant links with their sessions counted by status and the failed attention checks. */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study } = await requireRole(request, id, 'operator');
  return NextResponse.json({ links: await listSessionLinks(study) });
});

/** Creates a participant link for a frozen version (open at once). */
export const POST = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study, user } = await requireRole(request, id, 'operator');
  const input = await readJson(request, sessionLinkCreateSchema);
  return NextResponse.json({ link: await createSessionLink(user.id, study, input) }, { status: 201 });
});
