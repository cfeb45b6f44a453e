'use client';

import Link from 'next/link';
import type { ReactNode } from 'react';
import { QueryState } from '@/components/ui/query-state';
import { Notice } from '@/components/ui/notice';
import { ROLE_LABELS } from '@/lib/shared/roles';
import { ApiClientError } from '@/lib/client/api';
import { useStudy } from '@/lib/client/studies';
import { StudyContext, makeStudyContext } from './study-context';
import { StudyNav } from './study-nav';

/** Header, section tabs and the study context for every page of one study. */
export function StudyShell({ studyId, children }: { studyId: number; children: ReactNode }) {
  const query = useStudy(studyId);
  if (query.error instanceof ApiClientError && query.error.status === 404) {
    return (
      <Notice tone="error" title="Study not found">
        This study does not exist, or you are not one of its members.{' '}
        <Link href="/studies" className="underline">
          Back to your studies
        </Link>
      </Notice>
    );
  }
  return (
    <QueryState query={query} label="Loading the study…">
      {query.data ? (
        <StudyContext.Provider value={makeStudyContext(query.data.study, query.data.role)}>
          <div className="space-y-6">
            <div>
              <Link href="/studies" className="text-sm text-ink-soft hover:text-ink">
                ← All studies
              </Link>
              <div className="mt-1 flex flex-wrap items-baseline justify-between gap-2">
                <h1 data-testid="study-title">{query.data.study.name}</h1>
                <span className="rounded-full bg-teal-50 px-3 py-0.5 text-xs font-medium text-teal-700">Your role: {ROLE_LABELS[query.data.role]}</span>
              </div>
            </div>
            <StudyNav studyId={studyId} role={query.data.role} />
            {children}
          </div>
        </StudyContext.Provider>
      ) : null}
    </QueryState>
  );
}
