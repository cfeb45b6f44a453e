import type { Metadata } from 'next';
import { ApiPage } from '@/components/item-bank/api-page';

export const metadata: Metadata = { title: 'Probe-items API' };

export default function StudyApiPage() {
  return <ApiPage />;
}
