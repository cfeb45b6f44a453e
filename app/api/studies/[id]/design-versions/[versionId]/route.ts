import { NextResponse } from 'next/server';
import { route } from '@/lib/api/handler';
import { requireRole } from '@/lib/auth/session';
import { getVersion, versionJson } from '@/lib/services/designs';

/** One frozen version, by its id or by its SHA-256 content hash. */
export const GET = route<{ id: string; versionId: string }>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  return NextResponse.json({ version: versionJson(await getVersion(study.id, p.versionId)) });
});
