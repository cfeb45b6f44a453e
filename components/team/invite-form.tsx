'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import Link from 'next/link';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useStudyContext } from '@/components/studies/study-context';
import { ROLES, ROLE_LABELS } from '@/lib/shared/roles';
import { ApiClientError } from '@/lib/client/api';
import { useInvite } from '@/lib/client/team';
import { invitationSchema, type InvitationInput } from '@/lib/shared/validations/team';

/** Owners invite an address with a role; the link goes out by e-mail and works once, for 7 days. */
export function InviteForm({ mailboxEnabled }: { mailboxEnabled: boolean }) {
  const { study } = useStudyContext();
  const invite = useInvite(study.id);
  const [outcome, setOutcome] = useState<{ email: string; mailSent: boolean } | null>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm<InvitationInput>({
    resolver: zodResolver(invitationSchema),
    defaultValues: { email: '', role: 'viewer' },
  });

  const onSubmit = handleSubmit(async (values) => {
    setOutcome(null);
    try {
      const reply = await invite.mutateAsync(values);
      setOutcome({ email: reply.invitation.email, mailSent: reply.mailSent });
      reset({ email: '', role: values.role });
    } catch (error) {
      if (error instanceof ApiClientError) for (const issue of error.issues) setError(issue.path as keyof InvitationInput, { message: issue.message });
    }
  });

  return (
    <Card title="Invite someone">
      <form onSubmit={onSubmit} className="space-y-3" noValidate>
        {invite.error && !(invite.error instanceof ApiClientError && invite.error.issues.length) ? <Notice tone="error">{invite.error.message}</Notice> : null}
        {outcome?.mailSent ? (
          <Notice title="Invitation sent">
            {outcome.email} will find a link in their inbox.
            {mailboxEnabled ? (
              <>
                {' '}
                This installation keeps mail locally:{' '}
                <Link href="/mailbox" className="underline">
                  open the mailbox
                </Link>
                .
              </>
            ) : null}
          </Notice>
        ) : null}
        {outcome && !outcome.mailSent ? (
          <Notice tone="warning" title="Invitation saved, but not sent">
            The mail server did not accept the message for {outcome.email}. Try &ldquo;Resend&rdquo; below in a moment.
          </Notice>
        ) : null}
        <TextField label="E-mail" type="email" autoComplete="off" {...register('email')} error={formState.errors.email?.message} />
        <SelectField label="Role" {...register('role')} error={formState.errors.role?.message}>
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </SelectField>
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? 'Sending…' : 'Send invitation'}
        </Button>
        <p className="text-xs text-ink-soft">The link works once and for 7 days. People without an account create one from it.</p>
      </form>
    </Card>
  );
}
