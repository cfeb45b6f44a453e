import type { Metadata } from 'next';
import { NewStudyForm } from '@/components/studies/new-study-form';

export const metadata: Metadata = { title: 'New study' };

export default function NewStudyPage() {
  return <NewStudyForm />;
}
