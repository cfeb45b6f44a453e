import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { createDesign, designJson, listDesigns } from '@/lib/server/services/planner-designs';
import { designSpecSchema } from '@/lib/shared/validations/planner';

export const GET = route<{ id: string }>(async (request, { params }) => {
  const { study } = await requireRole(request, (await params).id, 'viewer');
  return NextResponse.json({ designs: await listDesigns(study.id) });
});

export const POST = route<{ id: string }>(async (request, { params }) => {
  const { user, study } = await requireRole(request, (await params).id, 'editor');
  const spec = await readJson(request, designSpecSchema);
  const row = await createDesign(user.id, study.id, spec);
  return NextResponse.json({ design: await designJson(study.id, row) }, { status: 201 });
});
