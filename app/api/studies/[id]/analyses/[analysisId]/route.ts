import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { getAnalysis, parseAnalysisId } from '@/lib/server/services/analyses';

type Params = { id: string; analysisId: string };

/** One saved analysis with its result and paragraph. */
export const GET = route<Params>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  return NextResponse.json({ analysis: await getAnalysis(study.id, parseAnalysisId(p.analysisId)) });
});
