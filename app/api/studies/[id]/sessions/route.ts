import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson, readQuery } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { sessionsCsv, setSessionIdleMinutes, studySessions } from '@/lib/server/services/session-status';
import { PERSON_CAUTION } from '@/lib/shared/cautions';
import { sessionSettingsSchema, sessionsQuerySchema } from '@/lib/shared/validations/session';

/** Participant sessions with their status and counts (?q=, ?status=, ?version= filter; ?format=csv exports them). */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study } = await requireRole(request, id, 'viewer');
  const query = readQuery(request, sessionsQuerySchema);
  const result = await studySessions(study, { search: query.q || undefined, versionId: query.version, status: query.status ?? null });
  if (query.format === 'csv') {
    return new Response(sessionsCsv(result.sessions), {
      headers: { 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="switchback-sessions-${study.id}.csv"`, 'Cache-Control': 'no-store' },
    });
  }
  return NextResponse.json({ ...result, caution: PERSON_CAUTION });
});

/** Sets the idle time after which an unfinished session counts as abandoned (operators). */
export const PATCH = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study, user } = await requireRole(request, id, 'operator');
  const input = await readJson(request, sessionSettingsSchema);
  return NextResponse.json(await setSessionIdleMinutes(user.id, study.id, input.idleMinutes));
});
