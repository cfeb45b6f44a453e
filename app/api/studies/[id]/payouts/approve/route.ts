import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { approvePayouts } from '@/lib/server/services/payouts-ledger';
import { approvePayoutsSchema } from '@/lib/shared/validations/payouts';

/** Owners approve a batch of payouts above the approval threshold (audited). */
export const POST = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study, user } = await requireRole(request, id, 'owner');
  const input = await readJson(request, approvePayoutsSchema);
  return NextResponse.json(await approvePayouts(user.id, study.id, input.ids));
});
