import { NextResponse } from 'next/server';
import { route } from '@/lib/api/handler';
import { requireRole } from '@/lib/auth/session';
import { parseEntityId } from '@/lib/services/planner-ids';
import { designSummary } from '@/lib/services/planner-summary';

/** The numbers of the design page, recomputed on the server (the same function the browser runs). */
export const GET = route<{ id: string; designId: string }>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  return NextResponse.json(await designSummary(study.id, parseEntityId(p.designId, 'Design')));
});
