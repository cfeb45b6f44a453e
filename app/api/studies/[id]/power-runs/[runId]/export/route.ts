import { route } from '@/lib/server/http/handler';
import { ValidationError } from '@/lib/server/errors';
import { requireRole } from '@/lib/server/auth/session';
import { EXPORT_FORMATS, exportRun, type ExportFormat } from '@/lib/server/services/power-export';
import { parseRunId } from '@/lib/server/services/power-runs';
import { parseRouteId } from '@/lib/server/route-ids';

type Params = { id: string; runId: string };

/**
 * Downloads of a finished run: `?format=svg|png|csv|json`; for figures, `&compare=<runId>` (repeatable)
 * draws other finished runs of the study on the same chart.
 */
export const GET = route<Params>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  const search = request.nextUrl.searchParams;
  const format = (search.get('format') ?? 'svg') as ExportFormat;
  if (!EXPORT_FORMATS.includes(format)) throw new ValidationError([{ path: 'format', message: `Choose one of ${EXPORT_FORMATS.join(', ')}.` }]);
  const compare = search.getAll('compare').map((raw) => {
    const id = parseRouteId(raw);
    if (id === null) throw new ValidationError([{ path: 'compare', message: 'Compare with the id of a finished run of this study.' }]);
    return id;
  });
  if (compare.length > 3) throw new ValidationError([{ path: 'compare', message: 'Compare at most four runs on one chart.' }]);
  const file = await exportRun(study.id, parseRunId(p.runId), format, compare);
  const body = typeof file.body === 'string' ? file.body : new Uint8Array(file.body);
  return new Response(body, {
    headers: { 'Content-Type': file.type, 'Content-Disposition': `attachment; filename="${file.file}"`, 'Cache-Control': 'private, no-store' },
  });
});
