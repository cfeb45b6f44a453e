'use client';

import Link from 'next/link';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { useResendConfirmation } from '@/lib/client/account';

/**
 * Says that an address is not confirmed yet and what that blocks, with a button for a new link and,
 * while the local mailbox is on, a way to it.
 */
export function AddressUnconfirmed({ email, blocks, mailbox }: { email: string; blocks: string; mailbox: boolean }) {
  const resend = useResendConfirmation();
  return (
    <div className="space-y-3" data-testid="address-unconfirmed">
      <Notice tone="warning" title="Your address is not confirmed yet">
        Open the link in the confirmation message we sent to {email}. Until then, {blocks}.
      </Notice>
      {resend.isSuccess ? <Notice>{resend.data.message}</Notice> : null}
      {resend.error ? <Notice tone="error">{resend.error.message}</Notice> : null}
      <div className="flex flex-wrap items-center gap-3">
        <Button variant="secondary" size="sm" disabled={resend.isPending} onClick={() => resend.mutate()}>
          {resend.isPending ? 'Sending…' : 'Send the confirmation link again'}
        </Button>
        {mailbox ? (
          <Link href="/mailbox" className="text-sm text-teal-700 underline">
            Open the mailbox
          </Link>
        ) : null}
      </div>
    </div>
  );
}
