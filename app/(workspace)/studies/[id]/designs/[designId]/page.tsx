import { notFound } from 'next/navigation';
import { DesignPage } from '@/components/planner/design-page';

export default async function StudyDesignPage({ params }: { params: Promise<{ designId: string }> }) {
  const { designId } = await params;
  if (!/^\d{1,10}$/.test(designId)) notFound();
  return <DesignPage designId={Number(designId)} />;
}
