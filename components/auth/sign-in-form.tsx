'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import Link from 'next/link';
import { signIn } from 'next-auth/react';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { signInSchema, type SignInInput } from '@/lib/shared/validations/user';

const MESSAGES: Record<string, string> = {
  TooManyAttempts: 'Too many failed attempts for this account or from this connection. Wait 15 minutes and try again.',
  CredentialsSignin: 'That e-mail and password do not match an account.',
};

export function SignInForm({ callbackUrl }: { callbackUrl: string }) {
  const [failure, setFailure] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<SignInInput>({ resolver: zodResolver(signInSchema) });

  const onSubmit = handleSubmit(async (values) => {
    setFailure(null);
    const result = await signIn('credentials', { ...values, redirect: false, callbackUrl });
    if (!result || result.error) {
      setFailure(MESSAGES[result?.error ?? ''] ?? 'Sign-in failed. If the database is starting up, try again in a moment.');
      return;
    }
    window.location.assign(callbackUrl);
  });

  return (
    <form onSubmit={onSubmit} className="space-y-4" noValidate>
      <h1 className="text-xl">Sign in</h1>
      {failure ? <Notice tone="error">{failure}</Notice> : null}
      <TextField label="E-mail" type="email" autoComplete="email" {...register('email')} error={formState.errors.email?.message} />
      <TextField label="Password" type="password" autoComplete="current-password" {...register('password')} error={formState.errors.password?.message} />
      <p className="-mt-2 text-right text-xs">
        <Link href="/forgot-password" className="text-teal-700 underline">
          Forgot your password?
        </Link>
      </p>
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? 'Signing in…' : 'Sign in'}
      </Button>
      <p className="text-center text-sm text-ink-soft">
        New here?{' '}
        <Link href={`/sign-up?callbackUrl=${encodeURIComponent(callbackUrl)}`} className="text-teal-700 underline">
          Create an account
        </Link>
      </p>
    </form>
  );
}
