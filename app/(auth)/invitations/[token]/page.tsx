import type { Metadata } from 'next';
import { InvitationGate } from '@/components/team/invitation-response';
import { getPageUser } from '@/lib/server/auth/session';
import { mailboxDir } from '@/lib/server/mail/mailbox';

// The token is in the address: keep it out of Referer headers sent to other sites.
export const metadata: Metadata = { title: 'Invitation', referrer: 'no-referrer' };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const [{ token }, user] = await Promise.all([params, getPageUser()]);
  return <InvitationGate token={token} user={user ? { email: user.email, emailVerified: user.emailVerified } : null} mailbox={mailboxDir() !== null} />;
}
