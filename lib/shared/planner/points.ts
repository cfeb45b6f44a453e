import { createRandom, priorPoints, type RatePoints } from '@/lib/design';
import { expectedRateNodes } from '@/lib/criteria';
import type { PriorValues } from '@/lib/shared/validations/planner';
import { PRIOR_DRAWS, PRIOR_SEED } from './types';

/** The prior's Monte Carlo draws for charts (seeded, so every run and every machine sees the same points). */
export function priorDraws(prior: PriorValues, count = PRIOR_DRAWS, seed = PRIOR_SEED): RatePoints {
  return priorPoints(prior, { method: 'monte-carlo', count, random: createRandom({ seed }) });
}

/** The prior's tensor Gauss–Hermite rule with `nodes` points per axis. */
export function priorNodes(prior: PriorValues, nodes: number): RatePoints {
  return priorPoints(prior, { method: 'quadrature', nodes });
}

/**
 * The prior's Gauss–Hermite nodes behind every expectation the planner reports, as many as keep
 * an expected reversal rate within 1e-4 of the exact expectation at choice sensitivity γ
 * (expectedRateNodes); `withinTarget` is false when γ·(spread) is beyond what the largest rule meets.
 */
export function expectationNodes(prior: PriorValues, gamma: number): RatePoints & { withinTarget: boolean } {
  const { nodes, withinTarget } = expectedRateNodes({ choice: { sensitivity: gamma }, prior });
  return { ...priorNodes(prior, nodes), withinTarget };
}

/** Weighted mean of f over the points (equal weights for draws). */
export function meanOver(points: RatePoints, f: (kSmall: number, kLarge: number, i: number) => number): number {
  const n = points.kSmall.length;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const v = f(points.kSmall[i], points.kLarge[i], i);
    sum += points.weights ? points.weights[i] * v : v;
  }
  return points.weights ? sum : sum / n;
}

/** Empirical quantile (linear interpolation between order statistics) of sorted values. */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}
