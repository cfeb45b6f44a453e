import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { updateStudySchema } from '@/lib/shared/validations/study';
import { deleteStudy, studyJson, updateStudy } from '@/lib/server/services/studies';

type Params = { id: string };

export const GET = route<Params>(async (request, { params }) => {
  const { study, role } = await requireRole(request, (await params).id, 'viewer');
  return NextResponse.json({ study: studyJson(study), role });
});

export const PATCH = route<Params>(async (request, { params }) => {
  const { user, study } = await requireRole(request, (await params).id, 'owner');
  const input = await readJson(request, updateStudySchema);
  const updated = await updateStudy(user.id, study.id, input);
  return NextResponse.json({ study: studyJson(updated) });
});

export const DELETE = route<Params>(async (request, { params }) => {
  const { user, study } = await requireRole(request, (await params).id, 'owner');
  await deleteStudy(user.id, study);
  return new NextResponse(null, { status: 204 });
});
