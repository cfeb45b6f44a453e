import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { readQuery } from '@/lib/server/http/read-json';
import { filteredParticipantsCsv, listStudyParticipants } from '@/lib/server/services/participant-list';
import { participantsQuerySchema } from '@/lib/shared/validations/session';

/**
 * A study's participants: ?q= part of an id, ?status=, ?version= (frozen version id), ?page=,
 * ?pageSize= (10, 25, 50, 100); ?format=csv downloads every participant the filters select.
 */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study } = await requireRole(request, id, 'viewer');
  const query = readQuery(request, participantsQuerySchema);
  if (query.format === 'csv') {
    return new Response(await filteredParticipantsCsv(study, query), {
      headers: { 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="switchback-participants-${study.id}.csv"`, 'Cache-Control': 'no-store' },
    });
  }
  return NextResponse.json(await listStudyParticipants(study, query));
});
