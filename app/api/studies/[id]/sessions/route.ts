import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { ValidationError } from '@/lib/server/errors';
import { sessionsCsv, setSessionIdleMinutes, studySessions } from '@/lib/server/services/session-status';
import { sessionSettingsSchema, sessionsQuerySchema } from '@/lib/shared/validations/session';

/** Participant sessions with their status and counts (?status= filters, ?format=csv exports). */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study } = await requireRole(request, id, 'viewer');
  const parsed = sessionsQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw new ValidationError(parsed.error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(query)', message: i.message })));
  const result = await studySessions(study, parsed.data.status ?? null);
  if (parsed.data.format === 'csv') {
    return new Response(sessionsCsv(result.sessions), {
      headers: { 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="switchback-sessions-${study.id}.csv"`, 'Cache-Control': 'no-store' },
    });
  }
  return NextResponse.json(result);
});

/** Sets the idle time after which an unfinished session counts as abandoned (operators). */
export const PATCH = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study, user } = await requireRole(request, id, 'operator');
  const input = await readJson(request, sessionSettingsSchema);
  return NextResponse.json(await setSessionIdleMinutes(user.id, study.id, input.idleMinutes));
});
