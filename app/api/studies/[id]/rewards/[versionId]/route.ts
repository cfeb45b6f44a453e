import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { parseEntityId } from '@/lib/server/route-ids';
import { saveRewardSettings } from '@/lib/server/services/payouts-ledger';
import { rewardSettingsSchema } from '@/lib/shared/validations/payouts';

/** Turns real rewards on or off for a frozen version and sets the draw's blocks, the cap and the approval threshold (owners; audited). */
export const PUT = route<{ id: string; versionId: string }>(async (request, { params }) => {
  const { id, versionId } = await params;
  const { study, user } = await requireRole(request, id, 'owner');
  const input = await readJson(request, rewardSettingsSchema);
  return NextResponse.json(await saveRewardSettings(user.id, study.id, parseEntityId(versionId, 'design version'), input));
});
