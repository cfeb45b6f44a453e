import { createRandom, priorPoints, type RatePoints } from '@/lib/design';
import type { PriorValues } from '@/lib/shared/validations/planner';
import { PRIOR_DRAWS, PRIOR_SEED, QUADRATURE_NODES } from './types';

/** The prior's Monte Carlo draws for charts (seeded, so every run and every machine sees the same points). */
export function priorDraws(prior: PriorValues, count = PRIOR_DRAWS, seed = PRIOR_SEED): RatePoints {
  return priorPoints(prior, { method: 'monte-carlo', count, random: createRandom({ seed }) });
}

/** Gauss–Hermite nodes of the prior, behind every expectation the planner reports. */
export function priorNodes(prior: PriorValues, nodes = QUADRATURE_NODES): RatePoints {
  return priorPoints(prior, { method: 'quadrature', nodes });
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
