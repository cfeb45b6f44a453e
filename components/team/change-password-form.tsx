'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { signOut } from 'next-auth/react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ApiClientError } from '@/lib/client/api';
import { useChangePassword } from '@/lib/client/team';
import { passwordChangeFormSchema, type PasswordChangeFormInput } from '@/lib/shared/validations/user';

/**
 * Changing the password while signed in. The server ends every session (this one too), so on
 * success the form says so and offers the way back in.
 */
export function ChangePasswordForm() {
  const change = useChangePassword();
  const { register, handleSubmit, formState, setError } = useForm<PasswordChangeFormInput>({ resolver: zodResolver(passwordChangeFormSchema) });
  const onSubmit = handleSubmit(async ({ currentPassword, newPassword }) => {
    try {
      await change.mutateAsync({ currentPassword, newPassword });
    } catch (error) {
      if (error instanceof ApiClientError) {
        for (const issue of error.issues) {
          if (issue.path === 'currentPassword' || issue.path === 'newPassword') setError(issue.path, { message: issue.message });
        }
      }
    }
  });

  if (change.data) {
    return (
      <Card title="Password">
        <div className="space-y-4">
          <Notice title="Password changed">{change.data.message}</Notice>
          <Button onClick={() => signOut({ callbackUrl: '/sign-in' })}>Sign in again</Button>
        </div>
      </Card>
    );
  }
  const fieldProblem = change.error instanceof ApiClientError && change.error.issues.length > 0;
  return (
    <Card title="Password">
      <form onSubmit={onSubmit} className="space-y-4" noValidate>
        <p className="text-sm text-ink-soft">Changing it signs you out everywhere, on this device too.</p>
        {change.error && !fieldProblem ? <Notice tone="error">{change.error.message}</Notice> : null}
        <TextField label="Current password" type="password" autoComplete="current-password" {...register('currentPassword')} error={formState.errors.currentPassword?.message} />
        <TextField label="New password" type="password" autoComplete="new-password" hint="At least 10 characters." {...register('newPassword')} error={formState.errors.newPassword?.message} />
        <TextField label="New password again" type="password" autoComplete="new-password" {...register('confirm')} error={formState.errors.confirm?.message} />
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? 'Changing…' : 'Change password'}
        </Button>
      </form>
    </Card>
  );
}
