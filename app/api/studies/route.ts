import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireUser } from '@/lib/server/auth/session';
import { createStudySchema } from '@/lib/shared/validations/study';
import { createStudy, listStudies, studyJson } from '@/lib/server/services/studies';

export const GET = route(async (request) => {
  const user = await requireUser(request);
  return NextResponse.json({ studies: await listStudies(user.id) });
});

export const POST = route(async (request) => {
  const user = await requireUser(request);
  const input = await readJson(request, createStudySchema);
  const study = await createStudy(user.id, input);
  return NextResponse.json({ study: studyJson(study), role: 'owner' }, { status: 201 });
});
