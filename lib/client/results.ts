'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AnalysisDto } from '@/lib/server/services/analyses';
import type { UploadReport } from '@/lib/server/services/observed-choices';
import type { AnalysisCreate, ExclusionRulesInput } from '@/lib/shared/validations/analysis';
import { ApiClientError, apiFetch } from './api';

export type { AnalysisDto, UploadReport };

export type ObservedSummary = {
  participants: number;
  withAnswers: number;
  complete: number;
  kept: number;
  exclusions: Array<{ rule: 'attentionCheck' | 'flaggedEstimates' | 'incompleteBlocks' | 'responseTimeFloor'; enabled: boolean; applies: number; removes: number }>;
};

export const resultsKeys = {
  observed: (studyId: number, versionId: number, rules: ExclusionRulesInput) => ['study', studyId, 'observed-choices', versionId, rules] as const,
  observedAll: (studyId: number) => ['study', studyId, 'observed-choices'] as const,
  analyses: (studyId: number) => ['study', studyId, 'analyses'] as const,
  analysis: (studyId: number, analysisId: number) => ['study', studyId, 'analyses', analysisId] as const,
};

const base = (studyId: number) => `/api/studies/${studyId}`;

/** Observed data of a version and what each exclusion rule would remove. */
export function useObservedSummary(studyId: number, versionId: number | null, rules: ExclusionRulesInput) {
  return useQuery({
    queryKey: resultsKeys.observed(studyId, versionId ?? 0, rules),
    enabled: versionId !== null,
    queryFn: () =>
      apiFetch<{ summary: ObservedSummary }>(`${base(studyId)}/observed-choices?${new URLSearchParams({ versionId: String(versionId), rules: JSON.stringify(rules) })}`).then((r) => r.summary),
  });
}

/** Uploads an observed-choices CSV; refreshes the observed counts (answers changed). */
export function useUploadChoices(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: async (text: string) => {
      const response = await fetch(`${base(studyId)}/observed-choices`, { method: 'POST', headers: { 'Content-Type': 'text/csv', Accept: 'application/json' }, body: text });
      const body = await response.json().catch(() => null);
      if (!response.ok) throw new ApiClientError(response.status, body?.error ?? `Upload failed (${response.status}).`, body?.issues ?? []);
      return (body as { report: UploadReport }).report;
    },
    onSuccess: () => client.invalidateQueries({ queryKey: resultsKeys.observedAll(studyId) }),
  });
}

export function useAnalyses(studyId: number) {
  return useQuery({ queryKey: resultsKeys.analyses(studyId), queryFn: () => apiFetch<{ analyses: AnalysisDto[] }>(`${base(studyId)}/analyses`).then((r) => r.analyses) });
}

export function useAnalysis(studyId: number, analysisId: number | null) {
  return useQuery({
    queryKey: resultsKeys.analysis(studyId, analysisId ?? 0),
    enabled: analysisId !== null,
    queryFn: () => apiFetch<{ analysis: AnalysisDto }>(`${base(studyId)}/analyses/${analysisId}`).then((r) => r.analysis),
  });
}

/** Runs and saves an analysis; the list gains it and its detail is cached. */
export function useCreateAnalysis(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: AnalysisCreate) => apiFetch<{ analysis: AnalysisDto }>(`${base(studyId)}/analyses`, { method: 'POST', json: input }).then((r) => r.analysis),
    onSuccess: (analysis) => {
      client.setQueryData(resultsKeys.analysis(studyId, analysis.id), analysis);
      client.invalidateQueries({ queryKey: resultsKeys.analyses(studyId), exact: true });
    },
  });
}

/** Download address of a saved analysis. */
export function analysisExportUrl(studyId: number, analysisId: number, format: 'csv' | 'json' | 'patterns.svg' | 'patterns.png' | 'zones.svg' | 'zones.png'): string {
  return `${base(studyId)}/analyses/${analysisId}/export?format=${encodeURIComponent(format)}`;
}
