import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { listFrozenVersions } from '@/lib/server/services/item-bank';

/** The study's frozen design versions an item bank can be exported from. */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study } = await requireRole(request, id, 'operator');
  return NextResponse.json({ versions: await listFrozenVersions(study.id) });
});
