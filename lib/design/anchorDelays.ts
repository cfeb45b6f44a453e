import { discountAfter, discountAt } from './discountFactor';
import { DesignInputError } from './DesignInputError';
import { findRoot, lastIterate, zeroin } from './findRoot';
import { optimiseLateDelay } from './optimiseLateDelay';
import type { LateDelayOptimum, ModelId, PairInput } from './types';

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
  return anchorsAround(input, optimum, maxFactor, options.target ?? optimum.gapProduct);
}

/**
 * anchorDelays for a validated input whose optimiseLateDelay result is already at hand (the item
 * bank's pairDelays computes it first): the same numbers, without solving the optimum twice.
 */
export function anchorsAround(input: PairInput, optimum: LateDelayOptimum, maxFactor: number, target: number): Anchors {
  const { model, ratio: x, soonDelay: d, kSmall: k, kLarge: K } = input;
  const s = model.sensitivity ?? 1;
  const beta = model.presentBias ?? 1;
  const farSoon = x * discountAt(model.id, k, s, beta, d);
  const lnSpan = Math.log(maxFactor);
  let late: AnchorPair | null = null;
  if (optimum.lower > d) {
    const edge = Math.log(optimum.lower - d);
    setSearch(model.id, s, beta, x, d, K, farSoon, target, -1);
    late = placeAnchor(edge, edge - lnSpan);
  }
  let soon: AnchorPair | null = null;
  if (Number.isFinite(optimum.upper) && optimum.upper * maxFactor < Number.MAX_VALUE) {
    const edge = Math.log(optimum.upper - d);
    setSearch(model.id, s, beta, x, d, K, farSoon, target, 1);
    soon = placeAnchor(edge, edge + lnSpan);
  }
  return { target, probe: optimum.gapProduct, late, soon };
}

// The anchor being searched for, in module state rather than closures: the search runs for every
// simulated participant of a power run, and a closure made per call costs more than the arithmetic
// (more still where a transpiler wraps each one to keep its name). Searches never nest.
let sId: ModelId = 'hyperbolic';
let sS = 1;
let sBeta = 1;
let sX = 0;
let sD = 0;
let sK = 0;
let sFarSoon = 0;
let sTarget = 0;
let sSide = -1;
let gFar = 0;
let gNear = 0;

function setSearch(id: ModelId, s: number, beta: number, x: number, d: number, K: number, farSoon: number, target: number, side: -1 | 1): void {
  sId = id;
  sS = s;
  sBeta = beta;
  sX = x;
  sD = d;
  sK = K;
  sFarSoon = farSoon;
  sTarget = target;
  sSide = side;
}

/** The far-view and near-view gaps at t = ln(D − d), into gFar and gNear. */
function gapsAt(t: number): void {
  const e = Math.exp(t);
  gFar = discountAt(sId, sK, sS, sBeta, sD + e) - sFarSoon;
  gNear = sX - discountAfter(sId, sK, sS, sBeta, e);
}

/** Anchor clarity at the gaps last computed: A·(−B) for a late anchor, (−A)·B for a soon one. */
function clarity(): number {
  return sSide < 0 ? gFar * -gNear : -gFar * gNear;
}

function excess(t: number): number {
  gapsAt(t);
  return clarity() - sTarget;
}

function placeAnchor(edge: number, bound: number): AnchorPair {
  let t = bound;
  let reachesTarget = false;
  const atBound = excess(bound);
  if (atBound >= 0) {
    const lo = sSide < 0 ? bound : edge;
    const hi = sSide < 0 ? edge : bound;
    t = rootOfExcess(lo, hi, sSide < 0 ? atBound : excess(lo), sSide < 0 ? excess(hi) : atBound);
    reachesTarget = true;
  }
  gapsAt(t);
  return { lateDelay: sD + Math.exp(t), far: gFar, near: gNear, clarity: clarity(), reachesTarget };
}

/** findRoot(excess, { lower, upper, tolerance: 1e-12 }).root, with the ends' values already at hand. */
function rootOfExcess(lower: number, upper: number, fl: number, fu: number): number {
  if (!(Number.isFinite(lower) && Number.isFinite(upper) && upper > lower && ((fl <= 0 && fu >= 0) || (fl >= 0 && fu <= 0)))) {
    return findRoot(excess, { lower, upper, tolerance: 1e-12 }).root; // reports the bad bracket
  }
  const root = zeroin(excess, lower, upper, fl, fu, 1e-12, 200);
  return Number.isNaN(root) ? lastIterate() : root;
}
