import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { getVersion, versionJson } from '@/lib/server/services/planner-designs';

/** One frozen version, by its id or by its SHA-256 content hash. */
export const GET = route<{ id: string; versionId: string }>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  return NextResponse.json({ version: versionJson(await getVersion(study.id, p.versionId)) });
});
