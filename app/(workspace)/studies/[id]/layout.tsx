import { notFound } from 'next/navigation';
import type { ReactNode } from 'react';
import { StudyShell } from '@/components/studies/study-shell';
import { parseRouteId } from '@/lib/server/route-ids';

export default async function StudyLayout({ children, params }: { children: ReactNode; params: Promise<{ id: string }> }) {
  const { id } = await params;
  const studyId = parseRouteId(id);
  if (studyId === null) notFound();
  return <StudyShell studyId={studyId}>{children}</StudyShell>;
}
