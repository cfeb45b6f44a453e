import type { Metadata } from 'next';
import { ConfirmAddress } from '@/components/account/confirm-address';
import { getPageUser } from '@/lib/server/auth/session';
import { describeConfirmationLink } from '@/lib/server/services/email-confirmation';

// The token is in the address: keep it out of Referer headers sent to other sites.
export const metadata: Metadata = { title: 'Confirm your address', referrer: 'no-referrer' };
export const dynamic = 'force-dynamic';

export default async function ConfirmEmailPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const [link, user] = await Promise.all([describeConfirmationLink(token), getPageUser()]);
  return <ConfirmAddress token={token} problem={link.message} signedIn={user !== null} />;
}
