import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { cancelPowerRun, parseRunId } from '@/lib/server/services/power-runs';

type Params = { id: string; runId: string };

/** Cancels a queued or running run (409 when it has already ended). */
export const POST = route<Params>(async (request, { params }) => {
  const p = await params;
  const { user, study } = await requireRole(request, p.id, 'editor');
  return NextResponse.json({ run: await cancelPowerRun(user.id, study.id, parseRunId(p.runId), user.name) });
});
