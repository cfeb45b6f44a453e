import type { Metadata } from 'next';
import { ResetPasswordGate } from '@/components/team/reset-password-form';

// The token is in the address: keep it out of Referer headers sent to other sites.
export const metadata: Metadata = { title: 'Choose a new password', referrer: 'no-referrer' };

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return <ResetPasswordGate token={token} />;
}
