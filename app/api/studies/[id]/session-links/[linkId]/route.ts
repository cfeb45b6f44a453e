import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { setSessionLinkStatus } from '@/lib/server/services/session-links';
import { sessionLinkStatusSchema } from '@/lib/shared/validations/session-links';

/** Opens, pauses or closes a participant link (closing is final). */
export const PATCH = route<{ id: string; linkId: string }>(async (request, { params }) => {
  const { id, linkId } = await params;
  const { study, user } = await requireRole(request, id, 'operator');
  const input = await readJson(request, sessionLinkStatusSchema);
  return NextResponse.json({ link: await setSessionLinkStatus(user.id, study, linkId, input) });
});
