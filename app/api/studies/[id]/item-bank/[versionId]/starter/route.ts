import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { loadVersion } from '@/lib/server/services/item-bank';
import { starterFileName, starterHtml } from '@/lib/server/services/starter';

/** Downloads the ready-to-host starter experiment of a frozen version (units and wording come from the key's calibration block). */
export const GET = route<{ id: string; versionId: string }>(async (request, { params }) => {
  const { id, versionId } = await params;
  const { study } = await requireRole(request, id, 'operator');
  const version = await loadVersion(study.id, versionId);
  // The address the operator's browser reached this server at: what a participant's browser will call.
  const url = new URL(request.url);
  const host = request.headers.get('host');
  const proto = request.headers.get('x-forwarded-proto') ?? url.protocol.replace(':', '');
  const html = starterHtml({ study, version, apiBase: host ? `${proto}://${host}` : url.origin });
  return new Response(html, {
    headers: { 'Content-Type': 'text/html; charset=utf-8', 'Content-Disposition': `attachment; filename="${starterFileName(study, version)}"`, 'Cache-Control': 'no-store' },
  });
});
