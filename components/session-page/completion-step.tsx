'use client';

import { useEffect, useRef, useState } from 'react';
import { Button, buttonClass } from '@/components/ui/button';
import type { PageCompletion } from '@/lib/shared/session-page';

/**
 * The end of a session: thanks, the completion code and, when the link has one, the way back to
 * where the participant came from (their id passed along). What the server adds to the
 * completion (PageCompletion) is shown here.
 */
export function CompletionStep({ completion, preview, pending = false, onPaymentDetails }: { completion: PageCompletion; preview: boolean; pending?: boolean; onPaymentDetails?: (email: string) => void }) {
  const heading = useRef<HTMLHeadingElement>(null);
  const [email, setEmail] = useState('');
  useEffect(() => heading.current?.focus(), []);
  return (
    <div className="space-y-4" data-testid="completion-step">
      <h2 ref={heading} tabIndex={-1} className="text-xl font-semibold outline-none">
        Thank you: you have finished
      </h2>
      {completion.reward ? (
        // real rewards: which choice was drawn for payment, how much and when
        <div className="space-y-2 rounded-md border border-teal-300 bg-teal-50 px-4 py-3" data-testid="completion-reward">
          <p>{completion.reward.message}</p>
          {completion.reward.needsDetails && onPaymentDetails ? (
            <form
              className="flex flex-wrap items-end gap-2"
              onSubmit={(event) => {
                event.preventDefault();
                onPaymentDetails(email);
              }}
            >
              <label className="text-sm">
                <span className="block font-medium">E-mail address for your reward link</span>
                <input className="w-72 rounded-md border border-ink/20 bg-paper-raised px-2 py-1.5" type="email" required value={email} onChange={(e) => setEmail(e.target.value)} autoComplete="email" />
              </label>
              <Button type="submit" size="sm" disabled={pending}>
                Send
              </Button>
            </form>
          ) : null}
        </div>
      ) : null}
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
