import type { Metadata } from 'next';
import { ParticipantsPage } from '@/components/item-bank/participants-page';

export const metadata: Metadata = { title: 'Participants' };

export default function StudyParticipantsPage() {
  return <ParticipantsPage />;
}
