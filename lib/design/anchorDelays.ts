import { discountAfter, discountAt } from './discountFactor';
import { DesignInputError } from './DesignInputError';
import { findRoot } from './findRoot';
import { optimiseLateDelay } from './optimiseLateDelay';
import type { ModelId, PairInput } from './types';

export type AnchorOptions = {
  /**
   * How far an anchor may sit from the zone, as a factor on D − d: the late anchor stays at
   * or above d + (D_lower − d)/maxFactor, the soon anchor at or below d + (D_upper − d)·maxFactor.
   * Default 4; must exceed 1.
   */
  maxFactor?: number;
  /** clarity the anchors aim for; default the probe's gap product at the optimum */
  target?: number;
};

export type AnchorPair = {
  /** late delay D of the anchor pair, days */
  lateDelay: number;
  /** far-view gap A (LL preferred when > 0) */
  far: number;
  /** near-view gap B (SS preferred when > 0) */
  near: number;
  /** product of the two gaps taken with the anchor's expected signs: A·(−B) late, (−A)·B soon */
  clarity: number;
  /** false when the distance bound stopped the anchor before it reached the target clarity */
  reachesTarget: boolean;
};

export type Anchors = { target: number; probe: number; late: AnchorPair | null; soon: AnchorPair | null };

/**
 * Late-anchor and soon-anchor delays on either side of the reversal zone.
 *
 * Rule: an anchor is the late delay closest to the zone whose anchor clarity equals the
 * target (by default the probe's gap product, so anchors are as clear-cut as the probe):
 * late anchor (both views LL) clarity A·(−B) on (d, D_lower), soon anchor (both views SS)
 * clarity (−A)·B on (D_upper, ∞). Both clarities are 0 at the zone edge and grow
 * monotonically away from it (A and −B both fall with D; −A and B both rise), so the
 * crossing is unique and found by the Brent–Dekker root finder in ln(D − d) on a
 * guaranteed bracket. If the distance bound (maxFactor) is reached first, the anchor sits on
 * the bound and reachesTarget is false. A side with no room (soon side when D_upper is
 * Infinity; late side when the zone starts at d) gives null.
 *
 * @returns null when the zone is empty
 * @throws DesignInputError for any pair field out of range, maxFactor ≤ 1, or a target that
 *   is not a positive finite number
 * @example anchorDelays({ model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 })?.late?.reachesTarget // true
 */
export function anchorDelays(input: PairInput, options: AnchorOptions = {}): Anchors | null {
  const maxFactor = options.maxFactor ?? 4;
  if (!(maxFactor > 1 && maxFactor < Infinity)) {
    throw new DesignInputError('maxFactor', 'a finite number greater than 1', maxFactor);
  }
  const optimum = optimiseLateDelay(input);
  if (options.target !== undefined && !(options.target > 0 && options.target < Infinity)) {
    throw new DesignInputError('target', 'a finite number greater than 0', options.target);
  }
  if (optimum === null) return null;
  const target = options.target ?? optimum.gapProduct;
  const { model, ratio: x, soonDelay: d, kSmall: k, kLarge: K } = input;
  const s = model.sensitivity ?? 1;
  const beta = model.presentBias ?? 1;
  const farSoon = x * discountAt(model.id, k, s, beta, d);
  const gaps = (t: number) => gapsAt(model.id, s, beta, x, d, K, farSoon, t);
  const lnSpan = Math.log(maxFactor);
  let late: AnchorPair | null = null;
  if (optimum.lower > d) {
    const edge = Math.log(optimum.lower - d);
    late = placeAnchor(gaps, edge, edge - lnSpan, d, target, -1);
  }
  let soon: AnchorPair | null = null;
  if (Number.isFinite(optimum.upper) && optimum.upper * maxFactor < Number.MAX_VALUE) {
    const edge = Math.log(optimum.upper - d);
    soon = placeAnchor(gaps, edge, edge + lnSpan, d, target, 1);
  }
  return { target, probe: optimum.gapProduct, late, soon };
}

type Gaps = { far: number; near: number };

function gapsAt(id: ModelId, s: number, beta: number, x: number, d: number, K: number, farSoon: number, t: number): Gaps {
  const e = Math.exp(t);
  return { far: discountAt(id, K, s, beta, d + e) - farSoon, near: x - discountAfter(id, K, s, beta, e) };
}

function placeAnchor(gaps: (t: number) => Gaps, edge: number, bound: number, d: number, target: number, side: -1 | 1): AnchorPair {
  const clarity = (t: number) => {
    const g = gaps(t);
    return side < 0 ? g.far * -g.near : -g.far * g.near;
  };
  const excess = (t: number) => clarity(t) - target;
  let t = bound;
  let reachesTarget = false;
  if (excess(bound) >= 0) {
    const [lo, hi] = side < 0 ? [bound, edge] : [edge, bound];
    t = findRoot(excess, { lower: lo, upper: hi, tolerance: 1e-12 }).root;
    reachesTarget = true;
  }
  const g = gaps(t);
  return { lateDelay: d + Math.exp(t), far: g.far, near: g.near, clarity: clarity(t), reachesTarget };
}
