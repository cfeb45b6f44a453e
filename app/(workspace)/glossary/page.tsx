import type { Metadata } from 'next';
import { GlossaryPage } from '@/components/glossary/glossary-page';

export const metadata: Metadata = { title: 'Methods and glossary · Switchback' };

export default function Page() {
  return <GlossaryPage />;
}
