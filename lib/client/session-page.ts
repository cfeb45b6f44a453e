'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PageState, SessionLinkDto } from '@/lib/shared/session-page';
import type { PageAction, PreviewState, SessionLinkCreateInput } from '@/lib/shared/validations/session-links';
import { apiFetch } from './api';

/** A step's reply: the state to show (also on a refused step that names the current one), or a problem. */
export type PageCall =
  | { ok: true; state: PageState; notice?: string }
  | { ok: false; status: number; message: string; issues: Array<{ path: string; message: string }>; state?: PageState; retryAfterMs?: number };

/** What drives a session page: a participant's (the server keeps the state) or a team member's preview (nothing stored). */
export type PageDriver = {
  load: () => Promise<PageCall>;
  act: (action: PageAction, block: 'calibration' | 'probe' | null) => Promise<PageCall>;
};

async function call(url: string, init: RequestInit): Promise<PageCall> {
  let response: Response;
  try {
    response = await fetch(url, { ...init, cache: 'no-store', credentials: 'same-origin', headers: { Accept: 'application/json', ...(init.method === 'POST' ? { 'Content-Type': 'application/json' } : {}) } });
  } catch {
    return { ok: false, status: 0, message: 'The connection was lost. Your answers so far are saved; retrying…', issues: [], retryAfterMs: 2000 };
  }
  const body = await response.json().catch(() => null);
  if (response.ok) return { ok: true, state: body as PageState, notice: (body as PageState).notice };
  const retry = response.status === 429 || response.status === 503 ? Number(response.headers.get('Retry-After') ?? '2') * 1000 : undefined;
  return { ok: false, status: response.status, message: body?.error ?? `Request failed (${response.status}).`, issues: body?.issues ?? [], state: body?.state, retryAfterMs: retry };
}

/** The participant's driver: every step goes to the server, which keeps the state (session token in an httpOnly cookie). */
export function participantDriver(slug: string, participantId: string): PageDriver {
  const base = `/api/session-page/${encodeURIComponent(slug)}`;
  return {
    load: () => call(`${base}?participantId=${encodeURIComponent(participantId)}`, { method: 'GET' }),
    act: (action) => call(base, { method: 'POST', body: JSON.stringify(action) }),
  };
}

/** A team member's preview: the answers stay in this page; the server computes each step from them and stores nothing. */
export function previewDriver(studyId: number, linkId: number): PageDriver {
  const state: Required<PreviewState> = { consented: false, begun: false, calibration: {}, stage2: {} };
  const url = `/api/studies/${studyId}/session-links/${linkId}/preview`;
  const send = () => call(url, { method: 'POST', body: JSON.stringify(state) });
  return {
    load: send,
    act: (action, block) => {
      if (action.action === 'consent') state.consented = true;
      else if (action.action === 'begin') state.begun = true;
      else if (action.action === 'payment-details') return send(); // a preview pays nobody: nothing to keep
      else if (block === 'probe') state.stage2[action.itemId] = action.chosen;
      else state.calibration[action.itemId] = action.chosen;
      return send();
    },
  };
}


export type { SessionLinkDto };

export const sessionLinkKeys = { list: (studyId: number) => ['study', studyId, 'session-links'] as const };

export function useSessionLinks(studyId: number) {
  return useQuery({ queryKey: sessionLinkKeys.list(studyId), queryFn: () => apiFetch<{ links: SessionLinkDto[] }>(`/api/studies/${studyId}/session-links`).then((r) => r.links) });
}

export function useCreateSessionLink(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: SessionLinkCreateInput) => apiFetch<{ link: SessionLinkDto }>(`/api/studies/${studyId}/session-links`, { method: 'POST', json: input }),
    onSuccess: () => client.invalidateQueries({ queryKey: sessionLinkKeys.list(studyId) }),
  });
}

export function useSetSessionLinkStatus(studyId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ linkId, status }: { linkId: number; status: SessionLinkDto['status'] }) => apiFetch<{ link: SessionLinkDto }>(`/api/studies/${studyId}/session-links/${linkId}`, { method: 'PATCH', json: { status } }),
    onSuccess: () => client.invalidateQueries({ queryKey: sessionLinkKeys.list(studyId) }),
  });
}
