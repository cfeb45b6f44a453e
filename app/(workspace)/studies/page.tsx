import type { Metadata } from 'next';
import { StudyList } from '@/components/studies/study-list';

export const metadata: Metadata = { title: 'Studies' };

export default function StudiesPage() {
  return <StudyList />;
}
