import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { AUDIT_LIST_LIMIT, listAuditEvents } from '@/lib/server/services/audit-trail';

/** The study's audit events, newest first. */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { study } = await requireRole(request, (await params).id, 'editor');
  return NextResponse.json({ events: await listAuditEvents(study.id), limit: AUDIT_LIST_LIMIT });
});
