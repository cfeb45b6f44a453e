import { notFound } from 'next/navigation';
import { RunView } from '@/components/power/run-view';

export default async function PowerRunPage({ params }: { params: Promise<{ runId: string }> }) {
  const { runId } = await params;
  if (!/^\d{1,10}$/.test(runId)) notFound();
  return <RunView runId={Number(runId)} />;
}
