'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role } from '@/lib/shared/roles';
import type { CreateStudyInput, UpdateStudyInput } from '@/lib/shared/validations/study';
import { apiFetch } from './api';

export type StudyDto = { id: number; name: string; description: string; version: number; createdAt: string; updatedAt: string };
export type StudySummaryDto = { id: number; name: string; description: string; role: Role; version: number; updatedAt: string };
export type MemberDto = { userId: number; name: string; email: string; role: Role; since: string };

export const studyKeys = {
  all: ['studies'] as const,
  one: (id: number) => ['study', id] as const,
  members: (id: number) => ['study', id, 'members'] as const,
};

export function useStudies() {
  return useQuery({ queryKey: studyKeys.all, queryFn: () => apiFetch<{ studies: StudySummaryDto[] }>('/api/studies').then((r) => r.studies) });
}

export function useStudy(id: number) {
  return useQuery({ queryKey: studyKeys.one(id), queryFn: () => apiFetch<{ study: StudyDto; role: Role }>(`/api/studies/${id}`) });
}

export function useMembers(id: number) {
  return useQuery({ queryKey: studyKeys.members(id), queryFn: () => apiFetch<{ members: MemberDto[] }>(`/api/studies/${id}/members`).then((r) => r.members) });
}

export function useCreateStudy() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateStudyInput) => apiFetch<{ study: StudyDto }>('/api/studies', { method: 'POST', json: input }).then((r) => r.study),
    onSuccess: () => client.invalidateQueries({ queryKey: studyKeys.all }),
  });
}

export function useUpdateStudy(id: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateStudyInput) => apiFetch<{ study: StudyDto }>(`/api/studies/${id}`, { method: 'PATCH', json: input }).then((r) => r.study),
    onSuccess: () => {
      client.invalidateQueries({ queryKey: studyKeys.one(id) });
      client.invalidateQueries({ queryKey: studyKeys.all });
    },
  });
}

export function useDeleteStudy(id: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: () => apiFetch<null>(`/api/studies/${id}`, { method: 'DELETE' }),
    onSuccess: () => {
      client.removeQueries({ queryKey: studyKeys.one(id) });
      client.invalidateQueries({ queryKey: studyKeys.all });
    },
  });
}
