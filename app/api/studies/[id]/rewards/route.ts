import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { listRewardSettings, REWARD_CAUTION } from '@/lib/server/services/payouts-ledger';

/** Every frozen version's real-reward settings (operators and above). */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study } = await requireRole(request, id, 'operator');
  return NextResponse.json({ versions: await listRewardSettings(study.id), caution: REWARD_CAUTION });
});
