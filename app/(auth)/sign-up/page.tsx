import type { Metadata } from 'next';
import { safeCallbackPath } from '@/lib/shared/callback-url';
import { SignUpForm } from '@/components/auth/sign-up-form';

export const metadata: Metadata = { title: 'Create an account' };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string; email?: string }> }) {
  const { callbackUrl, email } = await searchParams;
  const safe = safeCallbackPath(callbackUrl);
  return <SignUpForm callbackUrl={safe} email={email} />;
}
