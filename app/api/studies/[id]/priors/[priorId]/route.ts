import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { parseEntityId } from '@/lib/server/route-ids';
import { deletePrior, getPrior, priorJson, updatePrior } from '@/lib/server/services/priors';
import { priorSetUpdateSchema } from '@/lib/shared/validations/planner';

type Params = { id: string; priorId: string };

export const GET = route<Params>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  return NextResponse.json({ prior: priorJson(await getPrior(study.id, parseEntityId(p.priorId, 'Prior set'))) });
});

export const PUT = route<Params>(async (request, { params }) => {
  const p = await params;
  const { user, study } = await requireRole(request, p.id, 'editor');
  const { prior, version } = await readJson(request, priorSetUpdateSchema);
  return NextResponse.json({ prior: priorJson(await updatePrior(user.id, study.id, parseEntityId(p.priorId, 'Prior set'), prior, version)) });
});

export const DELETE = route<Params>(async (request, { params }) => {
  const p = await params;
  const { user, study } = await requireRole(request, p.id, 'editor');
  await deletePrior(user.id, study.id, parseEntityId(p.priorId, 'Prior set'));
  return new NextResponse(null, { status: 204 });
});
