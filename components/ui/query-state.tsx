'use client';

import type { ReactNode } from 'react';
import { ApiClientError } from '@/lib/client/api';
import { Notice } from './notice';

type QueryLike = { isPending: boolean; error: unknown; failureReason?: unknown };

function isUnavailable(error: unknown) {
  return error instanceof ApiClientError && (error.status === 503 || error.status === 0);
}

/**
 * Loading, error or content for one query. While react-query retries a database outage the
 * reason is shown at once, and the content appears by itself when the database is back.
 */
export function QueryState({ query, children, label = 'Loading…' }: { query: QueryLike; children: ReactNode; label?: string }) {
  const problem = query.error ?? (isUnavailable(query.failureReason) ? query.failureReason : null);
  if (problem && (query.isPending || query.error)) {
    const unavailable = isUnavailable(problem);
    return (
      <Notice tone={unavailable ? 'warning' : 'error'} title={unavailable ? 'Database unavailable' : 'Could not load this'}>
        {unavailable ? 'Switchback cannot reach its database right now. This page will refresh by itself when it is back.' : (problem as Error).message}
      </Notice>
    );
  }
  if (query.isPending) {
    return (
      <p className="text-sm text-ink-soft" aria-busy="true">
        {label}
      </p>
    );
  }
  return <>{children}</>;
}
