'use client';

import { useEffect, useRef } from 'react';
import { buttonClass } from '@/components/ui/button';
import type { PageCompletion } from '@/lib/shared/session-page';

/**
 * The end of a session: thanks, the completion code and, when the link has one, the way back to
 * where the participant came from (their id passed along). What the server adds to the
 * completion (PageCompletion) is shown here.
 */
export function CompletionStep({ completion, preview }: { completion: PageCompletion; preview: boolean }) {
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => heading.current?.focus(), []);
  return (
    <div className="space-y-4" data-testid="completion-step">
      <h2 ref={heading} tabIndex={-1} className="text-xl font-semibold outline-none">
        Thank you: you have finished
      </h2>
      <p>Your completion code is</p>
      <p className="rounded-md border border-ink/15 bg-paper-sunk px-4 py-3 text-center font-mono text-2xl tracking-wider break-all" data-testid="completion-code">
        {completion.code}
      </p>
      {completion.redirectUrl ? (
        <>
          <p>Keep the code, then continue to finish on the site you came from.</p>
          <a className={buttonClass('primary')} href={completion.redirectUrl} data-testid="completion-continue">
            Continue{preview ? ' (preview: the redirect with the participant id)' : ''}
          </a>
        </>
      ) : (
        <p>Keep the code; you can close this page now.</p>
      )}
    </div>
  );
}
