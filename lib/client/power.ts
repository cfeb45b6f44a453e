'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PowerRunDto } from '@/lib/server/services/power-runs';
import type { PowerRunSpecInput } from '@/lib/shared/validations/power';
import { apiFetch } from './api';

export type { PowerRunDto };

export const powerKeys = {
  runs: (studyId: number) => ['study', studyId, 'power-runs'] as const,
  run: (studyId: number, runId: number) => ['study', studyId, 'power-runs', runId] as const,
};

const base = (studyId: number) => `/api/studies/${studyId}/power-runs`;
const active = (status: string | undefined) => status === 'queued' || status === 'running';

/** The study's runs; polls every second while any of them is queued or running. */
export function usePowerRuns(studyId: number) {
  return useQuery({
    queryKey: powerKeys.runs(studyId),
    queryFn: () => apiFetch<{ runs: PowerRunDto[] }>(base(studyId)).then((r) => r.runs),
    refetchInterval: (query) => (query.state.data?.some((r) => active(r.status)) ? 1000 : false),
  });
}

/** One run with its results; polls every second while it is queued or running. */
export function usePowerRun(studyId: number, runId: number) {
  return useQuery({
    queryKey: powerKeys.run(studyId, runId),
    queryFn: () => apiFetch<{ run: PowerRunDto }>(`${base(studyId)}/${runId}`).then((r) => r.run),
    refetchInterval: (query) => (active(query.state.data?.status) ? 1000 : false),
  });
}

export function useStartPowerRun(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (spec: PowerRunSpecInput) => apiFetch<{ run: PowerRunDto }>(base(studyId), { method: 'POST', json: spec }).then((r) => r.run),
    onSuccess: () => client.invalidateQueries({ queryKey: powerKeys.runs(studyId), exact: true }),
  });
}

function useRunAction(studyId: number, runId: number, action: 'cancel' | 'restart') {
  const client = useQueryClient();
  return useMutation({
    mutationFn: () => apiFetch<{ run: PowerRunDto }>(`${base(studyId)}/${runId}/${action}`, { method: 'POST' }).then((r) => r.run),
    onSuccess: (run) => {
      client.setQueryData(powerKeys.run(studyId, runId), run);
      client.invalidateQueries({ queryKey: powerKeys.runs(studyId), exact: true });
    },
  });
}

export const useCancelPowerRun = (studyId: number, runId: number) => useRunAction(studyId, runId, 'cancel');
export const useRestartPowerRun = (studyId: number, runId: number) => useRunAction(studyId, runId, 'restart');

/** Download address of a finished run (figures may add runs to compare). */
export function powerExportUrl(studyId: number, runId: number, format: 'svg' | 'png' | 'csv' | 'json', compare: number[] = []): string {
  const query = new URLSearchParams({ format });
  for (const id of compare) query.append('compare', String(id));
  return `${base(studyId)}/${runId}/export?${query}`;
}
