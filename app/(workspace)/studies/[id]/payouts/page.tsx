import type { Metadata } from 'next';
import { PayoutsPage } from '@/components/payouts/payouts-page';

export const metadata: Metadata = { title: 'Payouts' };

export default function StudyPayoutsPage() {
  return <PayoutsPage />;
}
