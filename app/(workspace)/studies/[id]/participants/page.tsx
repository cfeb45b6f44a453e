import type { Metadata } from 'next';
import { Suspense } from 'react';
import { ParticipantsPage } from '@/components/item-bank/participants-page';

export const metadata: Metadata = { title: 'Participants' };

// The list reads its filters from the address (useSearchParams), which needs a Suspense boundary.
export default function StudyParticipantsPage() {
  return (
    <Suspense>
      <ParticipantsPage />
    </Suspense>
  );
}
