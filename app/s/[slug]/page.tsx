import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { ParticipantPage } from '@/components/session-page/participant-page';
import { NotFoundError } from '@/lib/server/errors';
import { openLinkBySlug } from '@/lib/server/services/session-page/session-page';

export const metadata: Metadata = { title: 'Study', robots: { index: false, follow: false } };

/** A participant link: public (no team account); the participant id arrives in the link's own query parameter. */
export default async function SessionLinkPage({ params, searchParams }: { params: Promise<{ slug: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { slug } = await params;
  const query = await searchParams;
  let participantParam: string;
  try {
    participantParam = (await openLinkBySlug(slug)).link.participantParam;
  } catch (error) {
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
  const raw = query[participantParam];
  return <ParticipantPage slug={slug} participantId={typeof raw === 'string' ? raw : ''} />;
}
