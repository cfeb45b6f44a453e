import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { PreviewPage } from '@/components/session-page/participant-page';
import { parseRouteId } from '@/lib/server/route-ids';

export const metadata: Metadata = { title: 'Preview session link' };

/** A team member runs a link as a participant would, without any record (the preview API checks the role). */
export default async function SessionLinkPreviewPage({ params }: { params: Promise<{ id: string; linkId: string }> }) {
  const { id, linkId } = await params;
  const studyId = parseRouteId(id);
  const link = parseRouteId(linkId);
  if (studyId === null || link === null) notFound();
  return <PreviewPage studyId={studyId} linkId={link} />;
}
