'use client';

import { useMemo } from 'react';
import { expectationNodes, priorDraws } from '@/lib/shared/planner/points';
import { DEFAULT_CHOICE_SENSITIVITY } from '@/lib/shared/planner/types';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import type { DesignSummary } from '@/lib/shared/planner/types';
import type { DesignSpec, PriorValues } from '@/lib/shared/validations/planner';

/**
 * The design page's numbers recomputed in the browser with the same lib/shared/planner function the
 * server runs. Prior points are kept while only design fields change.
 */
export function useLiveSummary(spec: DesignSpec | null, prior: PriorValues | null): { summary: DesignSummary | null; error: string | null } {
  const priorKey = prior ? JSON.stringify(prior) : '';
  // the number of quadrature nodes follows γ (expectationNodes), so the nodes are kept per prior and γ
  const gamma = spec?.choiceSensitivity ?? DEFAULT_CHOICE_SENSITIVITY;
  // eslint-disable-next-line react-hooks/exhaustive-deps -- keyed on the prior's values
  const draws = useMemo(() => (prior ? priorDraws(prior) : null), [priorKey]);
  // (a γ or prior the core refuses leaves the nodes to computeDesignSummary, which reports the error below)
  const nodes = useMemo(() => {
    if (!prior) return null;
    try {
      return expectationNodes(prior, gamma);
    } catch {
      return null;
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps -- keyed on the prior's values and γ
  }, [priorKey, gamma]);
  const points = useMemo(() => (draws ? { draws, ...(nodes ? { nodes } : {}) } : null), [draws, nodes]);
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
