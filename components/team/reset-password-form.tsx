'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import Link from 'next/link';
import { useForm } from 'react-hook-form';
import { Button, buttonClass } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useCompletePasswordReset, useResetLink } from '@/lib/client/team';
import { passwordResetFormSchema, type PasswordResetFormInput } from '@/lib/shared/validations/team';

/** Choosing a new password from a reset link; a link that cannot be used gets a clear message instead. */
function ResetPasswordForm({ token, problem }: { token: string; problem: string | null }) {
  const complete = useCompletePasswordReset();
  const { register, handleSubmit, formState } = useForm<PasswordResetFormInput>({ resolver: zodResolver(passwordResetFormSchema) });
  const onSubmit = handleSubmit((values) => complete.mutateAsync({ token, password: values.password }).catch(() => undefined));

  if (problem) {
    return (
      <div className="space-y-4">
        <h1 className="text-xl">This link cannot be used</h1>
        <Notice tone="warning">{problem}</Notice>
        <Link href="/forgot-password" className={buttonClass('secondary')}>
          Ask for a new link
        </Link>
      </div>
    );
  }
  if (complete.data) {
    return (
      <div className="space-y-4">
        <h1 className="text-xl">Password changed</h1>
        <Notice>{complete.data.message}</Notice>
        <Link href="/sign-in" className={buttonClass('primary')}>
          Sign in
        </Link>
      </div>
    );
  }
  return (
    <form onSubmit={onSubmit} className="space-y-4" noValidate>
      <h1 className="text-xl">Choose a new password</h1>
      {complete.error ? <Notice tone="error">{complete.error.message}</Notice> : null}
      <TextField label="New password" type="password" autoComplete="new-password" hint="At least 10 characters." {...register('password')} error={formState.errors.password?.message} />
      <TextField label="The same again" type="password" autoComplete="new-password" {...register('confirm')} error={formState.errors.confirm?.message} />
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? 'Saving…' : 'Save the new password'}
      </Button>
    </form>
  );
}

/** The reset page's body: checks the link first, then offers the form or says why it cannot be used. */
export function ResetPasswordGate({ token }: { token: string }) {
  const link = useResetLink(token);
  return (
    <QueryState query={link} label="Checking the link…">
      {link.data ? <ResetPasswordForm token={token} problem={link.data.message} /> : null}
    </QueryState>
  );
}
