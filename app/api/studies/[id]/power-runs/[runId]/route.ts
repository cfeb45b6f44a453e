import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { getPowerRun, parseRunId } from '@/lib/server/services/power-runs';

type Params = { id: string; runId: string };

/** One run: progress while running, results when finished. */
export const GET = route<Params>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  return NextResponse.json({ run: await getPowerRun(study.id, parseRunId(p.runId)) });
});
