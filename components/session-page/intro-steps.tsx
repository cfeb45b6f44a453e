'use client';

import { useEffect, useRef } from 'react';
import { Button } from '@/components/ui/button';
import type { PageLink } from '@/lib/shared/session-page';

function useFocusOnShow() {
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => heading.current?.focus(), []);
  return heading;
}

/** The team's consent text; agreeing starts the session (nothing is recorded before). */
export function ConsentStep({ link, pending, onAgree }: { link: PageLink; pending: boolean; onAgree: () => void }) {
  const heading = useFocusOnShow();
  return (
    <div className="space-y-4" data-testid="consent-step">
      <h2 ref={heading} tabIndex={-1} className="text-xl font-semibold outline-none">
        Consent
      </h2>
      <div className="max-h-[50vh] overflow-y-auto rounded-md border border-ink/10 bg-paper-raised p-4 whitespace-pre-line break-words" tabIndex={0} aria-label="Consent text">
        {link.consentText}
      </div>
      <p className="text-sm text-ink-soft">If you do not agree, close this page: nothing about you is recorded.</p>
      <Button onClick={onAgree} disabled={pending}>
        I agree and take part
      </Button>
    </div>
  );
}

/** The team's instructions, with the keys that answer. */
export function InstructionsStep({ link, pending, onBegin }: { link: PageLink; pending: boolean; onBegin: () => void }) {
  const heading = useFocusOnShow();
  return (
    <div className="space-y-4" data-testid="instructions-step">
      <h2 ref={heading} tabIndex={-1} className="text-xl font-semibold outline-none">
        Instructions
      </h2>
      <div className="whitespace-pre-line break-words">{link.instructions}</div>
      <p className="text-sm text-ink-soft">Choose by clicking or tapping an option, or with the keys ← or F (left) and → or J (right). Your progress is saved after every answer: if the page is closed or the connection drops, open the same link again to continue.</p>
      <Button onClick={onBegin} disabled={pending}>
        Start
      </Button>
    </div>
  );
}
