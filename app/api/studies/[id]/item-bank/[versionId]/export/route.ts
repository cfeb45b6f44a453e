import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { exportItemBank, loadVersion, readExportOptions } from '@/lib/server/services/item-bank';

/** Downloads the item bank as CSV or JSON (?format=csv|json); each download is audited. */
export const GET = route<{ id: string; versionId: string }>(async (request, { params }) => {
  const { id, versionId } = await params;
  const { study, user } = await requireRole(request, id, 'operator');
  const options = readExportOptions(request);
  const version = await loadVersion(study.id, versionId);
  const file = await exportItemBank(user.id, study, version, options);
  return new Response(file.body, {
    headers: { 'Content-Type': file.contentType, 'Content-Disposition': `attachment; filename="${file.filename}"`, 'Cache-Control': 'no-store' },
  });
});
