import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { previewSessionLink } from '@/lib/server/services/session-links';
import { previewStateSchema } from '@/lib/shared/validations/session-links';

/** The next step of a team member's preview run of a link, from what the preview answered so far; stores nothing. */
export const POST = route<{ id: string; linkId: string }>(async (request, { params }) => {
  const { id, linkId } = await params;
  const { study } = await requireRole(request, id, 'operator');
  const state = await readJson(request, previewStateSchema);
  return NextResponse.json(await previewSessionLink(study.id, linkId, state), { headers: { 'Cache-Control': 'no-store' } });
});
