import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { createAnalysis, listAnalyses } from '@/lib/server/services/analyses';
import { analysisCreateSchema } from '@/lib/shared/validations/analysis';

type Params = { id: string };

/** The study's saved analyses, newest first. */
export const GET = route<Params>(async (request, { params }) => {
  const { study } = await requireRole(request, (await params).id, 'viewer');
  return NextResponse.json({ analyses: await listAnalyses(study.id) });
});

/** Runs and saves a named, versioned analysis with the rules stated in the body; 201 with the result. */
export const POST = route<Params>(async (request, { params }) => {
  const { user, study } = await requireRole(request, (await params).id, 'editor');
  const input = await readJson(request, analysisCreateSchema);
  return NextResponse.json({ analysis: await createAnalysis(user.id, study.id, input) }, { status: 201 });
});
