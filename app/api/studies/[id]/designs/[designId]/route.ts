import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { deleteDesign, designJson, getDesign, updateDesign } from '@/lib/server/services/planner-designs';
import { parseEntityId } from '@/lib/server/route-ids';
import { designUpdateSchema } from '@/lib/shared/validations/planner';

type Params = { id: string; designId: string };

export const GET = route<Params>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  return NextResponse.json({ design: await designJson(study.id, await getDesign(study.id, parseEntityId(p.designId, 'Design'))) });
});

export const PUT = route<Params>(async (request, { params }) => {
  const p = await params;
  const { user, study } = await requireRole(request, p.id, 'editor');
  const { spec, version } = await readJson(request, designUpdateSchema);
  const row = await updateDesign(user.id, study.id, parseEntityId(p.designId, 'Design'), spec, version);
  return NextResponse.json({ design: await designJson(study.id, row) });
});

export const DELETE = route<Params>(async (request, { params }) => {
  const p = await params;
  const { user, study } = await requireRole(request, p.id, 'editor');
  await deleteDesign(user.id, study.id, parseEntityId(p.designId, 'Design'));
  return new NextResponse(null, { status: 204 });
});
