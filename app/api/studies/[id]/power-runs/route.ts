import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { createPowerRun, listPowerRuns } from '@/lib/server/services/power-runs';
import { createPowerRunSchema } from '@/lib/shared/validations/power';

type Params = { id: string };

/** The study's power runs, newest first. */
export const GET = route<Params>(async (request, { params }) => {
  const { study } = await requireRole(request, (await params).id, 'viewer');
  return NextResponse.json({ runs: await listPowerRuns(study.id) });
});

/** Saves a run and starts it in the background; 202 with the queued run. */
export const POST = route<Params>(async (request, { params }) => {
  const { user, study } = await requireRole(request, (await params).id, 'editor');
  const spec = await readJson(request, createPowerRunSchema);
  return NextResponse.json({ run: await createPowerRun(user.id, study.id, spec) }, { status: 202 });
});
