'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import Link from 'next/link';
import { signIn } from 'next-auth/react';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ApiClientError, apiFetch } from '@/lib/client/api';
import { signUpSchema, type SignUpInput } from '@/lib/shared/validations/user';

export function SignUpForm({ callbackUrl, email }: { callbackUrl: string; email?: string }) {
  const [failure, setFailure] = useState<string | null>(null);
  const [answer, setAnswer] = useState<string | null>(null);
  const { register, handleSubmit, formState, setError } = useForm<SignUpInput>({
    resolver: zodResolver(signUpSchema),
    defaultValues: { email: email ?? '' },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFailure(null);
    setAnswer(null);
    let reply: { message: string };
    try {
      reply = await apiFetch<{ message: string }>('/api/users', { method: 'POST', json: values });
    } catch (error) {
      if (error instanceof ApiClientError) {
        for (const issue of error.issues) setError(issue.path as keyof SignUpInput, { message: issue.message });
        setFailure(error.message);
        return;
      }
      throw error;
    }
    // The reply is the same whether or not the address was new; signing in with what was typed
    // works only for a new account (or the owner's own password).
    const result = await signIn('credentials', { email: values.email, password: values.password, redirect: false, callbackUrl });
    if (result?.error) {
      setAnswer(reply.message);
      return;
    }
    window.location.assign(callbackUrl);
  });

  return (
    <form onSubmit={onSubmit} className="space-y-4" noValidate>
      <h1 className="text-xl">Create an account</h1>
      {failure ? <Notice tone="error">{failure}</Notice> : null}
      {answer ? <Notice title="Check your inbox">{answer}</Notice> : null}
      <TextField label="Name" autoComplete="name" {...register('name')} error={formState.errors.name?.message} />
      <TextField label="E-mail" type="email" autoComplete="email" {...register('email')} error={formState.errors.email?.message} />
      <TextField
        label="Password"
        type="password"
        autoComplete="new-password"
        hint="At least 10 characters."
        {...register('password')}
        error={formState.errors.password?.message}
      />
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? 'Creating…' : 'Create account'}
      </Button>
      <p className="text-center text-sm text-ink-soft">
        Have an account?{' '}
        <Link href={`/sign-in?callbackUrl=${encodeURIComponent(callbackUrl)}`} className="text-teal-700 underline">
          Sign in
        </Link>
      </p>
    </form>
  );
}
