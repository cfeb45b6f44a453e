import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { AUDIT_LIST_LIMIT, listAuditEvents, listAuditNames } from '@/lib/server/services/audit-trail';

/** The study's audit events, newest first, with the current names of the designs, versions, priors and people they mention. */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { study } = await requireRole(request, (await params).id, 'editor');
  const [events, names] = await Promise.all([listAuditEvents(study.id), listAuditNames(study.id)]);
  return NextResponse.json({ events, names, limit: AUDIT_LIST_LIMIT });
});
