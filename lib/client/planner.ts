'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { DesignSummary } from '@/lib/shared/planner/types';
import type { PilotIssue } from '@/lib/shared/planner/pilot-csv';
import type { DesignSpec, FrozenDesign, PriorSetInput, PriorValues } from '@/lib/shared/validations/planner';
import { apiFetch } from './api';

export type PriorSetDto = { id: number; name: string; values: PriorValues; source: 'manual' | 'pilot'; notes: string; version: number; createdAt: string; updatedAt: string };
export type VersionSummaryDto = { id: number; number: number; hash: string; createdAt: string; frozenBy: number | null };
export type VersionDto = VersionSummaryDto & { designId: number; content: FrozenDesign };
export type DesignDto = { id: number; name: string; spec: DesignSpec; version: number; createdAt: string; updatedAt: string; latestVersion: VersionSummaryDto | null; frozen: boolean };
export type CommentDto = { id: number; designId: number; author: { id: number; name: string } | null; text: string; createdAt: string };
export type PilotFitDto = { ok: true; rows: number; prior: PriorValues; notes: string[] };
export type { PilotIssue };

export const plannerKeys = {
  priors: (studyId: number) => ['study', studyId, 'priors'] as const,
  prior: (studyId: number, priorId: number) => ['study', studyId, 'priors', priorId] as const,
  designs: (studyId: number) => ['study', studyId, 'designs'] as const,
  design: (studyId: number, designId: number) => ['study', studyId, 'designs', designId] as const,
  summary: (studyId: number, designId: number) => ['study', studyId, 'designs', designId, 'summary'] as const,
  comments: (studyId: number, designId: number) => ['study', studyId, 'designs', designId, 'comments'] as const,
  versions: (studyId: number) => ['study', studyId, 'design-versions'] as const,
};

const base = (studyId: number) => `/api/studies/${studyId}`;

export function usePriors(studyId: number) {
  return useQuery({ queryKey: plannerKeys.priors(studyId), queryFn: () => apiFetch<{ priors: PriorSetDto[] }>(`${base(studyId)}/priors`).then((r) => r.priors) });
}

export function usePrior(studyId: number, priorId: number) {
  return useQuery({ queryKey: plannerKeys.prior(studyId, priorId), queryFn: () => apiFetch<{ prior: PriorSetDto }>(`${base(studyId)}/priors/${priorId}`).then((r) => r.prior) });
}

export function useCreatePrior(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: PriorSetInput) => apiFetch<{ prior: PriorSetDto }>(`${base(studyId)}/priors`, { method: 'POST', json: input }).then((r) => r.prior),
    onSuccess: () => client.invalidateQueries({ queryKey: plannerKeys.priors(studyId) }),
  });
}

export function useUpdatePrior(studyId: number, priorId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: { prior: PriorSetInput; version: number }) => apiFetch<{ prior: PriorSetDto }>(`${base(studyId)}/priors/${priorId}`, { method: 'PUT', json: input }).then((r) => r.prior),
    onSuccess: (prior) => {
      client.setQueryData(plannerKeys.prior(studyId, priorId), prior);
      client.invalidateQueries({ queryKey: plannerKeys.priors(studyId), exact: true });
      // designs' frozen state and summaries depend on the prior's values
      client.invalidateQueries({ queryKey: plannerKeys.designs(studyId) });
    },
  });
}

export function useDeletePrior(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (priorId: number) => apiFetch<null>(`${base(studyId)}/priors/${priorId}`, { method: 'DELETE' }),
    onSuccess: () => client.invalidateQueries({ queryKey: plannerKeys.priors(studyId) }),
  });
}

/** Sends a pilot CSV as text/csv; a file with problems rejects with ApiClientError listing "line N: field" issues. */
export function useFitPilot(studyId: number) {
  return useMutation({
    mutationFn: ({ csv, model }: { csv: string; model: string }) =>
      apiFetch<PilotFitDto>(`${base(studyId)}/priors/pilot?model=${encodeURIComponent(model)}`, { method: 'POST', body: csv, headers: { 'Content-Type': 'text/csv' } }),
  });
}

export function useDesigns(studyId: number) {
  return useQuery({ queryKey: plannerKeys.designs(studyId), queryFn: () => apiFetch<{ designs: DesignDto[] }>(`${base(studyId)}/designs`).then((r) => r.designs) });
}

export function useDesign(studyId: number, designId: number) {
  return useQuery({ queryKey: plannerKeys.design(studyId, designId), queryFn: () => apiFetch<{ design: DesignDto }>(`${base(studyId)}/designs/${designId}`).then((r) => r.design) });
}

export function useDesignSummary(studyId: number, designId: number, enabled = true) {
  return useQuery({
    queryKey: plannerKeys.summary(studyId, designId),
    queryFn: () => apiFetch<{ summary: DesignSummary; designVersion: number }>(`${base(studyId)}/designs/${designId}/summary`),
    enabled,
  });
}

export function useCreateDesign(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (spec: DesignSpec) => apiFetch<{ design: DesignDto }>(`${base(studyId)}/designs`, { method: 'POST', json: spec }).then((r) => r.design),
    onSuccess: () => client.invalidateQueries({ queryKey: plannerKeys.designs(studyId), exact: true }),
  });
}

export function useUpdateDesign(studyId: number, designId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: { spec: DesignSpec; version: number }) => apiFetch<{ design: DesignDto }>(`${base(studyId)}/designs/${designId}`, { method: 'PUT', json: input }).then((r) => r.design),
    onSuccess: (design) => {
      client.setQueryData(plannerKeys.design(studyId, designId), design);
      client.invalidateQueries({ queryKey: plannerKeys.designs(studyId), exact: true });
      client.invalidateQueries({ queryKey: plannerKeys.summary(studyId, designId) });
    },
  });
}

export function useDeleteDesign(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (designId: number) => apiFetch<null>(`${base(studyId)}/designs/${designId}`, { method: 'DELETE' }),
    onSuccess: () => client.invalidateQueries({ queryKey: plannerKeys.designs(studyId), exact: true }),
  });
}

export function useFreezeDesign(studyId: number, designId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: () => apiFetch<{ version: VersionDto; created: boolean }>(`${base(studyId)}/designs/${designId}/freeze`, { method: 'POST' }),
    onSuccess: () => {
      client.invalidateQueries({ queryKey: plannerKeys.design(studyId, designId), exact: true });
      client.invalidateQueries({ queryKey: plannerKeys.designs(studyId), exact: true });
      client.invalidateQueries({ queryKey: plannerKeys.versions(studyId) });
    },
  });
}

export function useVersions(studyId: number, designId?: number) {
  return useQuery({
    queryKey: designId ? [...plannerKeys.versions(studyId), designId] : plannerKeys.versions(studyId),
    queryFn: () => apiFetch<{ versions: VersionDto[] }>(`${base(studyId)}/design-versions${designId ? `?design=${designId}` : ''}`).then((r) => r.versions),
  });
}

export function useComments(studyId: number, designId: number) {
  return useQuery({ queryKey: plannerKeys.comments(studyId, designId), queryFn: () => apiFetch<{ comments: CommentDto[] }>(`${base(studyId)}/designs/${designId}/comments`).then((r) => r.comments) });
}

export function useAddComment(studyId: number, designId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (text: string) => apiFetch<{ comment: CommentDto }>(`${base(studyId)}/designs/${designId}/comments`, { method: 'POST', json: { text } }).then((r) => r.comment),
    onSuccess: () => client.invalidateQueries({ queryKey: plannerKeys.comments(studyId, designId) }),
  });
}
