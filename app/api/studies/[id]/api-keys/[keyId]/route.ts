import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { revokeApiKey } from '@/lib/server/services/api-keys';

/** Revokes a key: it stops working at once. */
export const DELETE = route<{ id: string; keyId: string }>(async (request, { params }) => {
  const { id, keyId } = await params;
  const { study, user } = await requireRole(request, id, 'operator');
  return NextResponse.json({ key: await revokeApiKey(user.id, study.id, keyId) });
});
