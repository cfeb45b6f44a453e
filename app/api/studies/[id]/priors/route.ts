import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { createPrior, listPriors, priorJson } from '@/lib/server/services/priors';
import { priorSetSchema } from '@/lib/shared/validations/planner';

export const GET = route<{ id: string }>(async (request, { params }) => {
  const { study } = await requireRole(request, (await params).id, 'viewer');
  return NextResponse.json({ priors: await listPriors(study.id) });
});

export const POST = route<{ id: string }>(async (request, { params }) => {
  const { user, study } = await requireRole(request, (await params).id, 'editor');
  const input = await readJson(request, priorSetSchema);
  return NextResponse.json({ prior: priorJson(await createPrior(user.id, study.id, input)) }, { status: 201 });
});
