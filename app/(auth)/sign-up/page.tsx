import type { Metadata } from 'next';
import { SignUpForm } from '@/components/auth/sign-up-form';

export const metadata: Metadata = { title: 'Create an account' };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string; email?: string }> }) {
  const { callbackUrl, email } = await searchParams;
  const safe = callbackUrl?.startsWith('/') && !callbackUrl.startsWith('//') ? callbackUrl : '/studies';
  return <SignUpForm callbackUrl={safe} email={email} />;
}
