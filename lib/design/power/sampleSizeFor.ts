import { DesignInputError } from '../DesignInputError';

/** The sample size reaching a target power, read off a simulated power curve. */
export type SampleSizeAnswer =
  | { kind: 'interpolated'; n: number; between: [number, number] }
  | { kind: 'at-most'; n: number }
  | { kind: 'not-reached'; largest: number };

/**
 * Smallest sample size whose power reaches `target`, by linear interpolation between the two
 * simulated sizes that straddle it (rounded up to a whole participant). When the smallest
 * simulated size already reaches the target the answer is "at most" that size; when no size
 * does, "not reached" with the largest size simulated. Interpolated values are estimates
 * between simulated points, not simulated themselves.
 *
 * @param points sample sizes (ascending) with their power
 * @throws DesignInputError for an empty curve, sizes not ascending, or a target outside (0, 1)
 * @example sampleSizeFor([{ n: 20, power: 0.6 }, { n: 40, power: 0.9 }], 0.8) // { kind: 'interpolated', n: 34, between: [20, 40] }
 */
export function sampleSizeFor(points: ReadonlyArray<{ n: number; power: number }>, target: number): SampleSizeAnswer {
  if (!(target > 0 && target < 1)) throw new DesignInputError('target', 'a power strictly between 0 and 1', target);
  if (!Array.isArray(points) || points.length === 0) throw new DesignInputError('points', 'a non-empty power curve', points);
  for (let i = 1; i < points.length; i++) {
    if (!(points[i].n > points[i - 1].n)) throw new DesignInputError(`points[${i}].n`, 'sample sizes in ascending order', points[i].n);
  }
  const j = points.findIndex((p) => p.power >= target);
  if (j === -1) return { kind: 'not-reached', largest: points[points.length - 1].n };
  if (j === 0) return { kind: 'at-most', n: points[0].n };
  const a = points[j - 1];
  const b = points[j];
  const n = a.n + ((target - a.power) / (b.power - a.power)) * (b.n - a.n);
  // guard the rounding: 33.999999 must not become 35 through binary noise
  return { kind: 'interpolated', n: Math.ceil(n - 1e-9), between: [a.n, b.n] };
}
