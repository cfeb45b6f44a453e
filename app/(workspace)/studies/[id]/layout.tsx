import { notFound } from 'next/navigation';
import type { ReactNode } from 'react';
import { StudyShell } from '@/components/studies/study-shell';

export default async function StudyLayout({ children, params }: { children: ReactNode; params: Promise<{ id: string }> }) {
  const { id } = await params;
  if (!/^\d{1,10}$/.test(id)) notFound();
  return <StudyShell studyId={Number(id)}>{children}</StudyShell>;
}
