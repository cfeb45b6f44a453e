'use client';

import { Notice } from '@/components/ui/notice';
import { useStudyContext } from '@/components/studies/study-context';
import { REWARD_CAUTION } from '@/lib/shared/rewards';
import { PayoutLedger } from './payout-ledger';
import { RewardSettingsCard } from './reward-settings';

/** The payouts section: the caution, the reward settings per version and the ledger (operators and above). */
export function PayoutsPage() {
  const { can } = useStudyContext();
  if (!can('operator')) return <Notice title="Operators, editors and owners only">The payout ledger of this study is visible from the operator role up.</Notice>;
  return (
    <div className="space-y-4">
      <Notice tone="warning" title="Real rewards are for your ethics board to approve">
        {REWARD_CAUTION}
      </Notice>
      <RewardSettingsCard />
      <PayoutLedger />
    </div>
  );
}
