'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PayoutDto, RewardSettingsDto } from '@/lib/server/services/payouts-ledger';
import type { RewardSettingsInput } from '@/lib/shared/validations/payouts';
import { apiFetch } from './api';

export type { PayoutDto, RewardSettingsDto };
export type PayoutFilter = { status?: string; participant?: string; dueFrom?: string; dueTo?: string };
export type PayoutTotals = Record<string, Record<string, { count: number; amountMinor: number; amount: string }>>;

export const payoutKeys = {
  settings: (studyId: number) => ['study', studyId, 'rewards'] as const,
  ledger: (studyId: number, filter: PayoutFilter = {}) => ['study', studyId, 'payouts', filter] as const,
  ledgers: (studyId: number) => ['study', studyId, 'payouts'] as const,
};

/** The ledger's query string (filters left out when empty), shared by the list and the CSV link. */
export function payoutQuery(filter: PayoutFilter, format: 'json' | 'csv' = 'json'): string {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(filter)) if (v) params.set(k, v);
  if (format === 'csv') params.set('format', 'csv');
  return params.toString();
}

export function useRewardSettings(studyId: number) {
  return useQuery({ queryKey: payoutKeys.settings(studyId), queryFn: () => apiFetch<{ versions: RewardSettingsDto[]; caution: string }>(`/api/studies/${studyId}/rewards`) });
}

export function useSaveRewardSettings(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ versionId, input }: { versionId: number; input: RewardSettingsInput }) => apiFetch<RewardSettingsDto>(`/api/studies/${studyId}/rewards/${versionId}`, { method: 'PUT', json: input }),
    onSuccess: () => client.invalidateQueries({ queryKey: payoutKeys.settings(studyId) }),
  });
}

export function usePayouts(studyId: number, filter: PayoutFilter) {
  return useQuery({
    queryKey: payoutKeys.ledger(studyId, filter),
    queryFn: () => apiFetch<{ payouts: PayoutDto[]; totals: PayoutTotals; caution: string }>(`/api/studies/${studyId}/payouts?${payoutQuery(filter)}`),
    refetchInterval: 30_000,
  });
}

/** Approve or cancel a batch (owners); either changes the ledger only. */
export function usePayoutAction(studyId: number, action: 'approve' | 'cancel') {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: { ids: number[]; reason?: string }) => apiFetch<Record<string, number>>(`/api/studies/${studyId}/payouts/${action}`, { method: 'POST', json: input }),
    onSuccess: () => client.invalidateQueries({ queryKey: payoutKeys.ledgers(studyId) }),
  });
}
