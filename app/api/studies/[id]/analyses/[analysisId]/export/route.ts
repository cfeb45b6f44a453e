import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { ValidationError } from '@/lib/server/errors';
import { ANALYSIS_EXPORTS, exportAnalysis, parseAnalysisId, type AnalysisExport } from '@/lib/server/services/analyses';

type Params = { id: string; analysisId: string };

/** Downloads of a saved analysis: `?format=csv|json|patterns.svg|patterns.png|zones.svg|zones.png`. */
export const GET = route<Params>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  const format = (request.nextUrl.searchParams.get('format') ?? 'csv') as AnalysisExport;
  if (!ANALYSIS_EXPORTS.includes(format)) throw new ValidationError([{ path: 'format', message: `Choose one of ${ANALYSIS_EXPORTS.join(', ')}.` }]);
  const file = await exportAnalysis(study.id, parseAnalysisId(p.analysisId), format);
  const body = typeof file.body === 'string' ? file.body : new Uint8Array(file.body);
  return new Response(body, { headers: { 'Content-Type': file.type, 'Content-Disposition': `attachment; filename="${file.file}"`, 'Cache-Control': 'private, no-store' } });
});
