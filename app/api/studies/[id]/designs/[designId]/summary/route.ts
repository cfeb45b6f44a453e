import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { parseEntityId } from '@/lib/server/route-ids';
import { designSummary } from '@/lib/server/services/planner-summary';

/** The numbers of the design page, recomputed on the server (the same function the browser runs). */
export const GET = route<{ id: string; designId: string }>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  return NextResponse.json(await designSummary(study.id, parseEntityId(p.designId, 'Design')));
});
