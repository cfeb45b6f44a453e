'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { signOut } from 'next-auth/react';
import { AddressUnconfirmed } from '@/components/account/address-confirmation';
import { Button, buttonClass } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { formatDateTime } from '@/lib/shared/format';
import { ROLE_LABELS } from '@/lib/shared/roles';
import { useAcceptInvitation, useInvitationLink } from '@/lib/client/team';
import type { InvitationLinkView } from '@/lib/server/services/invitations';


/**
 * What an invitation link shows: a clear page for every state. A pending invitation is accepted
 * with a button (never just by opening the link, which mail scanners also do).
 */
type LinkUser = { email: string; emailVerified: boolean } | null;

function InvitationResponse({ token, view, user, mailbox }: { token: string; view: InvitationLinkView; user: LinkUser; mailbox: boolean }) {
  const accept = useAcceptInvitation();
  const router = useRouter();
  const here = `/invitations/${token}`;

  if (view.state !== 'pending') {
    const titles = { accepted: 'Invitation already used', expired: 'Invitation expired', revoked: 'Invitation withdrawn', unknown: 'Invitation not found' };
    return (
      <div className="space-y-4">
        <h1 className="text-xl">{titles[view.state]}</h1>
        <Notice tone={view.state === 'accepted' ? 'info' : 'warning'}>{view.message}</Notice>
        <Link href={user ? '/studies' : '/sign-in'} className={buttonClass('secondary')}>
          {user ? 'Go to your studies' : 'Sign in'}
        </Link>
      </div>
    );
  }

  const intro = (
    <p className="text-sm">
      You are invited to join <strong>{view.studyName}</strong> as <strong>{ROLE_LABELS[view.role].toLowerCase()}</strong>. The invitation was sent to{' '}
      <strong>{view.email}</strong>.
    </p>
  );

  if (!user) {
    return (
      <div className="space-y-4">
        <h1 className="text-xl">Join a study</h1>
        {intro}
        <div className="flex flex-col gap-2">
          <Link href={`/sign-up?email=${encodeURIComponent(view.email)}&callbackUrl=${encodeURIComponent(here)}`} className={buttonClass('primary')}>
            Create an account
          </Link>
          <Link href={`/sign-in?callbackUrl=${encodeURIComponent(here)}`} className={buttonClass('secondary')}>
            I have an account: sign in
          </Link>
        </div>
      </div>
    );
  }

  if (user.email.toLowerCase() !== view.email.toLowerCase()) {
    return (
      <div className="space-y-4">
        <h1 className="text-xl">Join a study</h1>
        {intro}
        <Notice tone="warning" title="Signed in with another address">
          You are signed in as {user.email}. Sign out, then sign in or create an account with {view.email} to accept.
        </Notice>
        <Button variant="secondary" onClick={() => signOut({ callbackUrl: here })}>
          Sign out
        </Button>
      </div>
    );
  }

  if (!user.emailVerified) {
    return (
      <div className="space-y-4">
        <h1 className="text-xl">Join a study</h1>
        {intro}
        <AddressUnconfirmed email={user.email} blocks="this invitation cannot be accepted" mailbox={mailbox} />
        <p className="text-xs text-ink-soft">Once it is confirmed, open this invitation link again.</p>
      </div>
    );
  }

  return (
    <div className="space-y-4">
      <h1 className="text-xl">Join a study</h1>
      {intro}
      {accept.error ? <Notice tone="error">{accept.error.message}</Notice> : null}
      <Button
        className="w-full"
        disabled={accept.isPending || accept.isSuccess}
        onClick={() => accept.mutate(token, { onSuccess: (reply) => router.push(`/studies/${reply.studyId}`) })}
      >
        {accept.isPending || accept.isSuccess ? 'Joining…' : 'Accept and open the study'}
      </Button>
      <p className="text-xs text-ink-soft">The link works once and until {formatDateTime(view.expiresAt)}.</p>
    </div>
  );
}

/** The invitation page's body: loads what the link leads to, then shows the matching answer. */
export function InvitationGate({ token, user, mailbox }: { token: string; user: LinkUser; mailbox: boolean }) {
  const link = useInvitationLink(token);
  return (
    <QueryState query={link} label="Opening the invitation…">
      {link.data ? <InvitationResponse token={token} view={link.data} user={user} mailbox={mailbox} /> : null}
    </QueryState>
  );
}
