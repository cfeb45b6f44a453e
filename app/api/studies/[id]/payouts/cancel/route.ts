import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { cancelPayouts } from '@/lib/server/services/payouts-ledger';
import { cancelPayoutsSchema } from '@/lib/shared/validations/payouts';

/** Owners cancel payouts not yet sent, with the reason (audited). */
export const POST = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study, user } = await requireRole(request, id, 'owner');
  const input = await readJson(request, cancelPayoutsSchema);
  return NextResponse.json(await cancelPayouts(user.id, study.id, input.ids, input.reason));
});
