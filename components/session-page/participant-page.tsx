'use client';

import { useMemo } from 'react';
import { participantDriver, previewDriver } from '@/lib/client/session-page';
import { PAGE_CAUTION } from '@/lib/shared/session-page';
import { Notice } from '@/components/ui/notice';
import { SessionRunner } from './session-runner';

/** The participant's page: the link's title, the steps, and the caution that this is a study, not an assessment. */
export function ParticipantPage({ slug, participantId }: { slug: string; participantId: string }) {
  const driver = useMemo(() => participantDriver(slug, participantId), [slug, participantId]);
  return (
    <div className="flex min-h-screen flex-col">
      <main className="mx-auto w-full max-w-xl flex-1 px-4 py-8">
        <SessionRunner driver={driver} />
      </main>
      <footer className="border-t border-ink/10 px-4 py-4 text-center text-xs text-ink-soft">{PAGE_CAUTION}</footer>
    </div>
  );
}

/** A team member's preview of a link: the same steps, nothing recorded. */
export function PreviewPage({ studyId, linkId }: { studyId: number; linkId: number }) {
  const driver = useMemo(() => previewDriver(studyId, linkId), [studyId, linkId]);
  return (
    <div className="mx-auto max-w-xl space-y-6">
      <Notice tone="warning" title="Preview">
        You are running this link as a participant would. Nothing is recorded: no session, no answers, no participant.
      </Notice>
      <SessionRunner driver={driver} preview />
      <p className="text-xs text-ink-soft">{PAGE_CAUTION}</p>
    </div>
  );
}
