'use client';

import { useMemo } from 'react';
import { priorDraws, priorNodes } from '@/lib/shared/planner/points';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import type { DesignSummary } from '@/lib/shared/planner/types';
import type { DesignSpec, PriorValues } from '@/lib/shared/validations/planner';

/**
 * The design page's numbers recomputed in the browser with the same lib/shared/planner function the
 * server runs. Prior points are kept while only design fields change.
 */
export function useLiveSummary(spec: DesignSpec | null, prior: PriorValues | null): { summary: DesignSummary | null; error: string | null } {
  const priorKey = prior ? JSON.stringify(prior) : '';
  // eslint-disable-next-line react-hooks/exhaustive-deps -- keyed on the prior's values
  const points = useMemo(() => (prior ? { draws: priorDraws(prior), nodes: priorNodes(prior) } : null), [priorKey]);
  const specKey = spec ? JSON.stringify(spec) : '';
  return useMemo(() => {
    if (!spec || !prior || !points) return { summary: null, error: null };
    try {
      return { summary: computeDesignSummary({ spec, prior }, points), error: null };
    } catch (error) {
      return { summary: null, error: error instanceof Error ? error.message : 'The numbers could not be computed.' };
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps -- keyed on the values
  }, [specKey, points]);
}
