'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role } from '@/lib/shared/roles';
import type { InvitationInput, NoticeSettingsInput, PasswordResetInput } from '@/lib/shared/validations/team';
import type { PasswordChangeInput } from '@/lib/shared/validations/user';
import type { InvitationLinkView } from '@/lib/server/services/invitations';
import { apiFetch } from './api';
import { studyKeys } from './studies';

export type InvitationDto = { id: number; email: string; role: Role; state: 'pending' | 'expired'; invitedBy: string | null; createdAt: string; expiresAt: string };
export type InvitationReply = { invitation: InvitationDto; mailSent: boolean };
export type AuditEventDto = { id: number; at: string; action: string; actorId: number | null; actorName: string | null; actorEmail: string | null; details: Record<string, unknown> };
export type AuditNamesDto = {
  designs: Record<string, string>;
  versions: Record<string, { designId: number; designName: string; number: number }>;
  priors: Record<string, string>;
  users: Record<string, string>;
};
export type MailboxMessageDto = { id: string; receivedAt: string; from: string; to: string; subject: string; text: string; recipients: string[] };

export const teamKeys = {
  invitations: (studyId: number) => ['study', studyId, 'invitations'] as const,
  audit: (studyId: number) => ['study', studyId, 'audit'] as const,
  mailbox: ['mailbox'] as const,
  notices: ['account', 'notices'] as const,
};

/** Open invitations of a study (owners only). */
export function useInvitations(studyId: number, enabled = true) {
  return useQuery({
    queryKey: teamKeys.invitations(studyId),
    queryFn: () => apiFetch<{ invitations: InvitationDto[] }>(`/api/studies/${studyId}/invitations`).then((r) => r.invitations),
    enabled,
  });
}

export function useInvite(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: InvitationInput) => apiFetch<InvitationReply>(`/api/studies/${studyId}/invitations`, { method: 'POST', json: input }),
    onSuccess: () => {
      client.invalidateQueries({ queryKey: teamKeys.invitations(studyId) });
      client.invalidateQueries({ queryKey: teamKeys.audit(studyId) });
      client.invalidateQueries({ queryKey: teamKeys.mailbox });
    },
  });
}

export function useResendInvitation(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (invitationId: number) => apiFetch<InvitationReply>(`/api/studies/${studyId}/invitations/${invitationId}/resend`, { method: 'POST' }),
    onSuccess: () => {
      client.invalidateQueries({ queryKey: teamKeys.invitations(studyId) });
      client.invalidateQueries({ queryKey: teamKeys.audit(studyId) });
      client.invalidateQueries({ queryKey: teamKeys.mailbox });
    },
  });
}

export function useRevokeInvitation(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (invitationId: number) => apiFetch<null>(`/api/studies/${studyId}/invitations/${invitationId}`, { method: 'DELETE' }),
    onSuccess: () => {
      client.invalidateQueries({ queryKey: teamKeys.invitations(studyId) });
      client.invalidateQueries({ queryKey: teamKeys.audit(studyId) });
    },
  });
}

export function useChangeRole(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ userId, role }: { userId: number; role: Role }) =>
      apiFetch<{ userId: number; role: Role; changed: boolean }>(`/api/studies/${studyId}/members/${userId}`, { method: 'PATCH', json: { role } }),
    onSuccess: () => {
      client.invalidateQueries({ queryKey: studyKeys.members(studyId) });
      client.invalidateQueries({ queryKey: studyKeys.one(studyId) }); // the actor's own role may have changed
      client.invalidateQueries({ queryKey: studyKeys.all });
      client.invalidateQueries({ queryKey: teamKeys.audit(studyId) });
    },
  });
}

export function useRemoveMember(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (userId: number) => apiFetch<null>(`/api/studies/${studyId}/members/${userId}`, { method: 'DELETE' }),
    onSuccess: () => {
      client.invalidateQueries({ queryKey: studyKeys.members(studyId) });
      client.invalidateQueries({ queryKey: studyKeys.all });
      client.invalidateQueries({ queryKey: teamKeys.audit(studyId) });
    },
  });
}

/** The study's audit events (owners and editors). */
export function useAuditEvents(studyId: number) {
  return useQuery({
    queryKey: teamKeys.audit(studyId),
    queryFn: () => apiFetch<{ events: AuditEventDto[]; names: AuditNamesDto; limit: number }>(`/api/studies/${studyId}/audit`),
  });
}

/** Messages kept by the local test mail server; refreshed every few seconds while open. */
export function useMailbox() {
  return useQuery({
    queryKey: teamKeys.mailbox,
    queryFn: () => apiFetch<{ enabled: boolean; address: string; messages: MailboxMessageDto[] }>('/api/mailbox'),
    refetchInterval: 3000,
  });
}

export function useNoticeSettings() {
  return useQuery({ queryKey: teamKeys.notices, queryFn: () => apiFetch<{ notices: NoticeSettingsInput }>('/api/account/notices').then((r) => r.notices) });
}

export function useUpdateNoticeSettings() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: NoticeSettingsInput) => apiFetch<{ notices: NoticeSettingsInput }>('/api/account/notices', { method: 'PUT', json: input }).then((r) => r.notices),
    onSuccess: (notices) => client.setQueryData(teamKeys.notices, notices),
  });
}

/** What an invitation link leads to (public: the holder may not have an account yet). */
export function useInvitationLink(token: string) {
  return useQuery({
    queryKey: ['invitation-link', token] as const,
    queryFn: () => apiFetch<{ view: InvitationLinkView }>(`/api/invitations/${encodeURIComponent(token)}`).then((r) => r.view),
    staleTime: 0,
  });
}

/** Whether a password-reset link can still be used. */
export function useResetLink(token: string) {
  return useQuery({
    queryKey: ['reset-link', token] as const,
    queryFn: () => apiFetch<{ state: string; message: string | null }>(`/api/password-reset/${encodeURIComponent(token)}`),
    staleTime: 0,
  });
}

export function useAcceptInvitation() {
  return useMutation({
    mutationFn: (token: string) => apiFetch<{ studyId: number; role: Role; alreadyMember: boolean }>('/api/invitations/accept', { method: 'POST', json: { token } }),
  });
}

export function useRequestPasswordReset() {
  return useMutation({
    mutationFn: (email: string) => apiFetch<{ message: string }>('/api/password-reset', { method: 'POST', json: { email } }),
  });
}

export function useChangePassword() {
  return useMutation({
    mutationFn: (input: PasswordChangeInput) => apiFetch<{ message: string }>('/api/account/password', { method: 'PUT', json: input }),
  });
}

export function useCompletePasswordReset() {
  return useMutation({
    mutationFn: (input: PasswordResetInput) => apiFetch<{ message: string }>('/api/password-reset/complete', { method: 'POST', json: input }),
  });
}
