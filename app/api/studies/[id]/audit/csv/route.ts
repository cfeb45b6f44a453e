import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { exportAuditCsv } from '@/lib/server/services/audit-trail';

/** The audit trail as a CSV download (cells neutralised against spreadsheet formulas). */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { user, study } = await requireRole(request, (await params).id, 'editor');
  const csv = await exportAuditCsv(user.id, study.id);
  return new Response(csv, {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Disposition': `attachment; filename="study-${study.id}-audit-trail.csv"`,
      'Cache-Control': 'no-store',
    },
  });
});
