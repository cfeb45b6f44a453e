import type { Metadata } from 'next';
import { SessionLinksPage } from '@/components/session-links/session-links-page';

export const metadata: Metadata = { title: 'Session links' };

export default function StudySessionLinksPage() {
  return <SessionLinksPage />;
}
