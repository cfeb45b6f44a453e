'use client';

import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { BankItem, RoundingReport } from '@/lib/design';
import type { ApiKeyCreateInput } from '@/lib/shared/validations/api-keys';
import type { ExportOptions } from '@/lib/shared/validations/item-bank';
import type { ParticipantsQuery } from '@/lib/shared/validations/session';
import { BROWSER_KEY_PLACEHOLDER } from '@/lib/shared/starter-runtime';
import { ApiClientError, apiFetch } from './api';

export type FrozenVersionDto = { id: number; number: number; hash: string; designName: string; mode: 'personalised' | 'population'; currency: string; frozenAt: string };
export type ItemBankPreviewDto = {
  header: { study: { id: number; name: string }; designVersion: { id: number; number: number; hash: string; name: string }; mode: string; seed: number; currency: string; delayUnit: string; amountUnit: number; minGap: number; probeGap: number; itemBankId: string; choiceModel: { sensitivity: number; lapse: number; unit: string } };
  designPoint: { kSmall: number; kLarge: number; soonDelay: number; lateDelay: number };
  probeRule: string | null;
  items: BankItem[];
  rounding: RoundingReport;
  extrapolation: { message: string } | null;
  /** simulated share of probe pairs outside the true zone under delay sensitivity below 1 (personalised designs) */
  extrapolationRisk: { low: number; high: number; outside: number; outsideAssumed: number; message: string } | null;
  notes: string[];
};
export type ApiKeyDto = {
  id: number;
  name: string;
  prefix: string;
  kind: 'server' | 'browser';
  allowedOrigins: string[];
  designVersionId: number;
  presentation: { seed: number; delayUnit: 'days' | 'weeks' | 'months'; minGap: number } | null;
  itemBankId: string | null;
  createdBy: string | null;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
};
type RateDto = { rate: number; standardErrorLog: number | null; interval: { lower: number; upper: number } | null; flags: string[] };
export type ParticipantDto = {
  id: number;
  participantId: string;
  designVersionId: number;
  source: 'api' | 'batch';
  flag: string | null;
  itemSet: string;
  kSmall: RateDto;
  kLarge: RateDto;
  extrapolation: string | null;
  attentionCheck: string;
  items: BankItem[];
  servedAt: string;
};
export type BatchResultDto =
  | { participantId: string; line: number; status: 'served'; reply: { flag: string | null; itemSet: string; items: BankItem[] } }
  | { participantId: string; line: number; status: 'refused'; httpStatus: number; message: string; issues: Array<{ path: string; message: string }> };

export const itemBankKeys = {
  versions: (studyId: number) => ['study', studyId, 'item-bank', 'versions'] as const,
  preview: (studyId: number, versionId: number, options: Partial<ExportOptions>) => ['study', studyId, 'item-bank', versionId, options] as const,
  apiKeys: (studyId: number) => ['study', studyId, 'api-keys'] as const,
  participants: (studyId: number) => ['study', studyId, 'participants'] as const,
};

/** Query string of export options (only the ones set). */
export function exportQuery(options: Partial<ExportOptions>): string {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(options)) if (v !== undefined) params.set(k, String(v));
  return params.toString();
}

export function useFrozenVersions(studyId: number) {
  return useQuery({ queryKey: itemBankKeys.versions(studyId), queryFn: () => apiFetch<{ versions: FrozenVersionDto[] }>(`/api/studies/${studyId}/item-bank`).then((r) => r.versions) });
}

export function useItemBankPreview(studyId: number, versionId: number | null, options: Partial<ExportOptions>) {
  return useQuery({
    queryKey: itemBankKeys.preview(studyId, versionId ?? 0, options),
    queryFn: () => apiFetch<ItemBankPreviewDto>(`/api/studies/${studyId}/item-bank/${versionId}?${exportQuery(options)}`),
    enabled: versionId !== null,
  });
}

export function useApiKeys(studyId: number) {
  return useQuery({ queryKey: itemBankKeys.apiKeys(studyId), queryFn: () => apiFetch<{ keys: ApiKeyDto[] }>(`/api/studies/${studyId}/api-keys`).then((r) => r.keys) });
}

export function useCreateApiKey(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: ApiKeyCreateInput) => apiFetch<{ key: ApiKeyDto; secret: string }>(`/api/studies/${studyId}/api-keys`, { method: 'POST', json: input }),
    onSuccess: () => client.invalidateQueries({ queryKey: itemBankKeys.apiKeys(studyId) }),
  });
}

export function useRevokeApiKey(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (keyId: number) => apiFetch<{ key: ApiKeyDto }>(`/api/studies/${studyId}/api-keys/${keyId}`, { method: 'DELETE' }),
    onSuccess: () => client.invalidateQueries({ queryKey: itemBankKeys.apiKeys(studyId) }),
  });
}

/** One participant on the list: the session, and what they were served (null before serving). */
export type ParticipantRowDto = SessionDto & { served: ParticipantDto | null };
export type ParticipantPageDto = {
  total: number;
  page: number;
  pageSize: number;
  pageCount: number;
  counts: Record<SessionStatusDto, number>;
  idleMinutes: number;
  participants: ParticipantRowDto[];
  caution: string;
};

/** The list's query as URL parameters (defaults left out, so links stay short); `format=csv` and no page for the export. */
export function participantsSearch(query: ParticipantsQuery, options: { csv?: boolean } = {}): string {
  const params = new URLSearchParams();
  if (query.q) params.set('q', query.q);
  if (query.status) params.set('status', query.status);
  if (query.version) params.set('version', String(query.version));
  if (options.csv) params.set('format', 'csv');
  else {
    if (query.page > 1) params.set('page', String(query.page));
    if (query.pageSize !== 25) params.set('pageSize', String(query.pageSize));
  }
  return params.toString();
}

/** One page of the study's participants (search, status, version); the previous page stays shown while the next loads. */
export function useParticipantPage(studyId: number, query: ParticipantsQuery) {
  const search = participantsSearch(query);
  return useQuery({
    queryKey: [...itemBankKeys.participants(studyId), search],
    queryFn: () => apiFetch<ParticipantPageDto>(`/api/studies/${studyId}/participants${search ? `?${search}` : ''}`),
    placeholderData: keepPreviousData,
    refetchInterval: 15_000,
  });
}

/**
 * The same batch again as CSV (one row per served item). Serving is idempotent, so asking twice
 * with the same answers returns the same items and records nothing new.
 */
export async function fetchBatchCsv(studyId: number, input: { designVersionId: number; csv: string }): Promise<string> {
  const response = await fetch(`/api/studies/${studyId}/participants/batch?format=csv`, {
    method: 'POST',
    headers: { Accept: 'text/csv', 'Content-Type': 'application/json' },
    body: JSON.stringify(input),
  });
  if (!response.ok) {
    const body = await response.json().catch(() => null);
    throw new ApiClientError(response.status, body?.error ?? `Request failed (${response.status}).`, body?.issues ?? []);
  }
  return response.text();
}

export function useServeBatch(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: { designVersionId: number; csv: string }) => apiFetch<{ results: BatchResultDto[] }>(`/api/studies/${studyId}/participants/batch`, { method: 'POST', json: input }).then((r) => r.results),
    onSuccess: () => client.invalidateQueries({ queryKey: itemBankKeys.participants(studyId) }),
  });
}

/**
 * Downloads a version's starter experiment; with a browser key's secret (shown once, right after it
 * was created) the key is written into the file here in the browser, so the server never sees it again.
 */
export async function downloadStarter(studyId: number, versionId: number, secret?: string): Promise<void> {
  const response = await fetch(`/api/studies/${studyId}/item-bank/${versionId}/starter`);
  if (!response.ok) throw new ApiClientError(response.status, `The starter could not be downloaded (${response.status}).`);
  const name = /filename="([^"]+)"/.exec(response.headers.get('content-disposition') ?? '')?.[1] ?? 'switchback-starter.html';
  let html = await response.text();
  if (secret) html = html.replace(BROWSER_KEY_PLACEHOLDER, secret);
  const url = URL.createObjectURL(new Blob([html], { type: 'text/html' }));
  const link = document.createElement('a');
  link.href = url;
  link.download = name;
  document.body.appendChild(link);
  link.click();
  link.remove();
  URL.revokeObjectURL(url);
}

export type SessionStatusDto = 'started' | 'calibrated' | 'served' | 'completed' | 'abandoned';
export type SessionDto = {
  participantId: string;
  designVersionId: number;
  status: SessionStatusDto;
  source: string;
  startedAt: string;
  servedAt: string | null;
  completedAt: string | null;
  lastActivityAt: string;
  answered: number;
  itemCount: number;
};

export function useSetIdleMinutes(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (idleMinutes: number) => apiFetch<{ idleMinutes: number }>(`/api/studies/${studyId}/sessions`, { method: 'PATCH', json: { idleMinutes } }),
    onSuccess: () => client.invalidateQueries({ queryKey: itemBankKeys.participants(studyId) }),
  });
}
