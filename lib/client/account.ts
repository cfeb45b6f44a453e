'use client';

import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api';
import { teamKeys } from './team';

/** Confirms an address with the token from its confirmation link. */
export function useConfirmAddress() {
  return useMutation({
    mutationFn: (token: string) => apiFetch<{ message: string }>('/api/email-confirmation', { method: 'POST', json: { token } }),
  });
}

/** Mails the signed-in user a new confirmation link; the mailbox then holds it. */
export function useResendConfirmation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: () => apiFetch<{ message: string }>('/api/email-confirmation/resend', { method: 'POST' }),
    onSuccess: () => client.invalidateQueries({ queryKey: teamKeys.mailbox }),
  });
}
