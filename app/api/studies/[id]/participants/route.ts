import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { listParticipants, participantsCsv } from '@/lib/server/services/participants';

/** Participants served in this study (?format=csv downloads one row per item served). */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study } = await requireRole(request, id, 'viewer');
  const participants = await listParticipants(study.id);
  if (new URL(request.url).searchParams.get('format') === 'csv') {
    return new Response(participantsCsv(participants), {
      headers: { 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="switchback-participants-${study.id}.csv"`, 'Cache-Control': 'no-store' },
    });
  }
  return NextResponse.json({ participants });
});
