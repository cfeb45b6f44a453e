import { notFound } from 'next/navigation';
import { DesignPage } from '@/components/planner/design-page';
import { parseRouteId } from '@/lib/server/route-ids';

export default async function StudyDesignPage({ params }: { params: Promise<{ designId: string }> }) {
  const { designId } = await params;
  const id = parseRouteId(designId);
  if (id === null) notFound();
  return <DesignPage designId={id} />;
}
