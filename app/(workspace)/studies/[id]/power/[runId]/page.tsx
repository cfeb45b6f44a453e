import { notFound } from 'next/navigation';
import { RunView } from '@/components/power/run-view';
import { parseRouteId } from '@/lib/server/route-ids';

export default async function PowerRunPage({ params }: { params: Promise<{ runId: string }> }) {
  const { runId } = await params;
  const id = parseRouteId(runId);
  if (id === null) notFound();
  return <RunView runId={id} />;
}
