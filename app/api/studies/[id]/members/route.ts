import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { listMembers } from '@/lib/server/services/studies';

export const GET = route<{ id: string }>(async (request, { params }) => {
  const { study } = await requireRole(request, (await params).id, 'viewer');
  return NextResponse.json({ members: await listMembers(study.id) });
});
