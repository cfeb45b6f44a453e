import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { SignInForm } from '@/components/auth/sign-in-form';
import { getPageUser } from '@/lib/server/auth/session';

export const metadata: Metadata = { title: 'Sign in' };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string }> }) {
  const { callbackUrl } = await searchParams;
  const safe = callbackUrl?.startsWith('/') && !callbackUrl.startsWith('//') ? callbackUrl : '/studies';
  if (await getPageUser()) redirect(safe);
  return <SignInForm callbackUrl={safe} />;
}
