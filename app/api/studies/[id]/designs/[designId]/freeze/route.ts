import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { freezeDesignReporting, versionJson } from '@/lib/server/services/planner-designs';
import { notifyDesignFrozen } from '@/lib/server/services/notices';
import { parseEntityId } from '@/lib/server/route-ids';

/** Freezes the current draft into an immutable, content-hashed version (201; 200 when unchanged since the last freeze). */
export const POST = route<{ id: string; designId: string }>(async (request, { params }) => {
  const p = await params;
  const { user, study } = await requireRole(request, p.id, 'editor');
  const { version, created } = await freezeDesignReporting(user.id, study.id, parseEntityId(p.designId, 'Design'));
  if (created) void notifyDesignFrozen(study.id, version.hash, user.id); // after the commit; never rejects
  return NextResponse.json({ version: versionJson(version), created }, { status: created ? 201 : 200 });
});
