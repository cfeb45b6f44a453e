'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import Link from 'next/link';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useRequestPasswordReset } from '@/lib/client/team';
import { passwordResetRequestSchema, type PasswordResetRequestInput } from '@/lib/shared/validations/team';

/** Asks for a reset link. The answer never says whether the address has an account. */
export function ForgotPasswordForm() {
  const request = useRequestPasswordReset();
  const { register, handleSubmit, formState } = useForm<PasswordResetRequestInput>({ resolver: zodResolver(passwordResetRequestSchema) });
  const onSubmit = handleSubmit((values) => request.mutateAsync(values.email).catch(() => undefined));

  return (
    <form onSubmit={onSubmit} className="space-y-4" noValidate>
      <h1 className="text-xl">Forgot your password?</h1>
      {request.data ? (
        <Notice title="Check your inbox">{request.data.message}</Notice>
      ) : (
        <p className="text-sm text-ink-soft">Enter the address you sign in with. We will send a link to choose a new password.</p>
      )}
      {request.error ? <Notice tone="error">{request.error.message}</Notice> : null}
      <TextField label="E-mail" type="email" autoComplete="email" {...register('email')} error={formState.errors.email?.message} />
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? 'Sending…' : 'Send the link'}
      </Button>
      <p className="text-center text-sm text-ink-soft">
        <Link href="/sign-in" className="text-teal-700 underline">
          Back to sign-in
        </Link>
      </p>
    </form>
  );
}
