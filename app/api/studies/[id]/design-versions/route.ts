import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { listVersions } from '@/lib/server/services/planner-designs';
import { parseEntityId } from '@/lib/server/route-ids';

/** Frozen versions of the study, newest first; `?design=<id>` narrows to one design. */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { study } = await requireRole(request, (await params).id, 'viewer');
  const design = request.nextUrl.searchParams.get('design');
  return NextResponse.json({ versions: await listVersions(study.id, design ? parseEntityId(design, 'Design') : undefined) });
});
