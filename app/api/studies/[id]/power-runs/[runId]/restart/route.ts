import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { parseRunId, restartPowerRun } from '@/lib/server/services/power-runs';

type Params = { id: string; runId: string };

/** Runs an interrupted, cancelled or failed run again from the start (409 otherwise). */
export const POST = route<Params>(async (request, { params }) => {
  const p = await params;
  const { user, study } = await requireRole(request, p.id, 'editor');
  return NextResponse.json({ run: await restartPowerRun(user.id, study.id, parseRunId(p.runId)) }, { status: 202 });
});
