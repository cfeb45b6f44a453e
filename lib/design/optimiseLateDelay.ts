import { zoneConstants, type ZoneConstants } from './zoneBounds';
import { checkPairInput } from './validate';
import type { ModelId, PairInput } from './types';

/** The reversal zone and the late delay (days) inside it with the largest gap product A·B. */
export type LateDelayOptimum = { lower: number; upper: number; lateDelay: number; gapProduct: number };

const LOG_MAX = Math.log(Number.MAX_VALUE);
const scratch: ZoneConstants = { a: 0, b: 0, p: 1, span: 0 };

/**
 * The late delay D* that maximises the gap product C(D) = A(D)·B(D) inside the reversal zone.
 *
 * Hyperbolic (closed form). Write p = 1 + KD, c = Kd, a = x/(1 + kd), so A = 1/p − a and
 * B = x − 1/(p − c). Setting d ln C/dD = 0 gives −1/(p(1 − ap)) + 1/(q(xq − 1)) = 0 with
 * q = p − c, i.e. the quadratic (x + a)p² − 2(1 + xc)p + c(1 + xc) = 0, whose discriminant
 * factorises as (1 + xc)(1 − ac). The quadratic is negative at the lower bound and positive
 * at the upper bound, so the maximum is its larger root:
 *   p* = [(1 + xc) + √((1 + xc)(1 − ac))] / (x + a),   D* = (p* − 1)/K.
 *
 * Exponential and quasi-hyperbolic (closed form). With u = exp(−KD), A = βu − xβe^(−kd) and
 * B = x − βe^(Kd)u are linear in u, so C is a concave quadratic in u with vertex
 * u* = x(1 + βe^((K−k)d)) / (2βe^(Kd)), i.e.
 *   D* = d + [ln(2β/x) − ln(1 + βe^(−(k−K)d))] / K   (β = 1 for the exponential model).
 * For quasi-hyperbolic with β ≤ x the zone starts at D = d and the vertex can fall below it;
 * then C is largest as D → d⁺ and D* = d is returned with the limiting gap product.
 * For the exponential model (β = 1 > x) the vertex always lies inside a non-empty zone, and
 * with m = e^(−(k−K)d) − 1 it reads D* = D_lower − ln(1 + m/2)/K, C* = x²·e^(−Kd)·m²/4.
 *
 * Hyperboloid, power-delay, exponential-power (numerical). C′ > 0 at D_lower (where B = 0,
 * B′ > 0) and C′ < 0 at D_upper (where A = 0, A′ < 0), so C′ = f_K′(D)·B − A·f_K′(D − d)
 * changes sign on the zone: a guaranteed bracket. The root is found in t = ln(D − d) by
 * Newton steps with analytic C″ kept inside the shrinking bracket by bisection (Press et al.
 * 2007, Numerical Recipes §9.4), to 1e-10 in t, i.e. 1e-10 relative in D. (A function-value
 * maximiser such as Brent's cannot place a smooth maximum better than ~1.5e-8 relative, so the
 * tests hold this root against Brent's maximiser, fmin's bisection and the closed forms.)
 *
 * Bounds are the closed forms of reversalZone.
 *
 * @returns null when the zone is empty
 * @throws DesignInputError for any field out of range
 * @example optimiseLateDelay({ model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 })?.lateDelay // (80/3)·(0.5 + √(35/32)) ≈ 41.222
 */
export function optimiseLateDelay(input: PairInput): LateDelayOptimum | null {
  const model = input.model;
  const x = input.ratio;
  const d = input.soonDelay;
  const k = input.kSmall;
  const K = input.kLarge;
  // validation as plain comparisons on the hot path; the full check runs only to report a failure
  if (!(x > 0 && x < 1 && d >= 0 && d < Infinity && k > 0 && k < Infinity && K > 0 && K < Infinity) || model === null || typeof model !== 'object') {
    return invalid(input);
  }
  const s = model.sensitivity;
  const beta = model.presentBias;
  if ((s !== undefined && !(s > 0 && s < Infinity)) || (beta !== undefined && !(beta > 0 && beta <= 1))) return invalid(input);
  const id = model.id;
  if (id === 'hyperbolic') return d === 0 ? null : hyperbolicOptimum(x, d, k, K);
  if (id === 'exponential') return d === 0 ? null : exponentialOptimum(x, d, k, K);
  if (id === 'quasi-hyperbolic') return d === 0 ? null : presentBiasOptimum(x, d, k, K, beta ?? 1);
  if (id === 'hyperboloid' || id === 'power-delay' || id === 'exponential-power') {
    return d === 0 ? null : numericalOptimum(id, s ?? 1, x, d, k, K);
  }
  return invalid(input);
}

function invalid(input: PairInput): never {
  checkPairInput(input.model, input.ratio, input.soonDelay, input.kSmall, input.kLarge);
  throw new Error('optimiseLateDelay: input rejected'); // unreachable: checkPairInput throws first
}

function hyperbolicOptimum(x: number, d: number, k: number, K: number): LateDelayOptimum | null {
  // non-empty iff k > xK; tested as k·d/x > K·d, the same expression reversalZone uses
  if (!((k * d) / x > K * d)) return null;
  const xK = x * K;
  const lower = d + (1 - x) / xK;
  const upper = (1 - x + k * d) / xK;
  const c = K * d;
  const a = x / (1 + k * d);
  const xc1 = 1 + x * c;
  const p = (xc1 + Math.sqrt(xc1 * (1 - a * c))) / (x + a);
  const gapProduct = (1 / p - a) * (x - 1 / (p - c));
  return { lower, upper, lateDelay: (p - 1) / K, gapProduct };
}

/**
 * The β = 1 case of presentBiasOptimum, to the last bit, with emptiness (k·d > K·d) tested before
 * any logarithm: about half of all random rate pairs give an empty zone, and each Math.log,
 * expm1, log1p or exp is a library call costing more than the validation and arithmetic of a
 * whole hyperbolic solve.
 */
function exponentialOptimum(x: number, d: number, k: number, K: number): LateDelayOptimum | null {
  const kd = k * d;
  if (!(kd > K * d)) return null;
  const lnR = -Math.log(x);
  const lower = d + lnR / K;
  const upper = (kd + lnR) / K;
  // m = e^y − 1 with y = (K − k)d < 0: no cancellation near the emptiness boundary
  const m = Math.expm1((K - k) * d);
  const lateDelay = lower - Math.log1p(0.5 * m) / K;
  return { lower, upper, lateDelay, gapProduct: 0.25 * x * x * Math.exp(-K * d) * m * m };
}

function presentBiasOptimum(x: number, d: number, k: number, K: number, beta: number): LateDelayOptimum | null {
  const lnR = -Math.log(x);
  const lnBeta = Math.log(beta);
  const a = Math.max(0, lnBeta + lnR);
  // zone width is (k·d + ln r − a − K·d)/K; its sign is tested on the rates (as in reversalZone), not on rounded bounds
  const span = a > 0 ? k * d - lnBeta : k * d + lnR;
  if (!(span > K * d)) return null;
  const lower = d + a / K;
  const upper = (k * d + lnR) / K;
  // y = ln β + (K − k)d; the vertex is D* = d + [ln 2 + ln β + ln r − ln(1 + e^y)]/K
  const y = lnBeta + (K - k) * d;
  if (a > 0) {
    // β > x, so non-emptiness forces y < 0. D* − D_lower = −ln(1 + expm1(y)/2)/K has no
    // cancellation, and at the vertex A = x·e^(−Kd)·(1 − e^y)/2 and B = x·(1 − e^y)/2.
    const m = Math.expm1(y);
    const lateDelay = lower - Math.log1p(0.5 * m) / K;
    return { lower, upper, lateDelay, gapProduct: 0.25 * x * x * Math.exp(-K * d) * m * m };
  }
  const log1pEy = y > 0 ? y + Math.log1p(Math.exp(-y)) : Math.log1p(Math.exp(y));
  let lateDelay = d + (Math.LN2 + lnBeta + lnR - log1pEy) / K;
  let nearFactor: number; // f_K(D − d) just right of d
  if (lateDelay > d) {
    nearFactor = beta * Math.exp(-K * (lateDelay - d));
  } else {
    lateDelay = d; // the zone starts at d and C is largest as D → d⁺
    nearFactor = beta;
  }
  const far = beta * (Math.exp(-K * lateDelay) - x * Math.exp(-k * d));
  return { lower, upper, lateDelay, gapProduct: far * (x - nearFactor) };
}

function numericalOptimum(id: ModelId, s: number, x: number, d: number, k: number, K: number): LateDelayOptimum | null {
  const cst = zoneConstants(id, x, d, k, s, 1, scratch);
  const p = cst.p;
  if (p === 1 && !(cst.span > K * d)) return null;
  const tLow = p * Math.log(cst.a / K);
  const lower = d + Math.exp(tLow);
  const upper = p === 1 ? cst.b / K : Math.pow(cst.b / K, p);
  if (!(upper > lower)) return null;
  const tHigh = Math.min(LOG_MAX, p * Math.log(cst.b / K) + Math.log1p(-d / upper));
  const farSoon = x * (id === 'hyperboloid' ? Math.pow(1 + k * d, -s) : id === 'power-delay' ? 1 / (1 + k * Math.pow(d, s)) : Math.exp(-k * Math.pow(d, s)));
  const t = slopeRoot(id, s, x, d, K, farSoon, tLow, tHigh);
  const lateDelay = d + Math.exp(t);
  return { lower, upper, lateDelay, gapProduct: slope.far * slope.near };
}

/** Results of the last slope evaluation (module scratch keeps the hot loop allocation-free). */
const slope = { value: 0, derivative: 0, far: 0, near: 0 };

/**
 * Root of φ(t) = (ln C)′(d + e^t) on [lo, hi] with φ(lo) > 0 > φ(hi): Newton steps on φ, replaced by
 * bisection whenever a step would leave the shrinking bracket (Press et al. 2007, Numerical
 * Recipes 3rd ed., §9.4, "rtsafe"). Stops when a step moves t by less than 1e-10, i.e. D by
 * less than 1e-10 relative. Leaves the gaps of the returned point in `slope`.
 */
function slopeRoot(id: ModelId, s: number, x: number, d: number, K: number, farSoon: number, lo: number, hi: number): number {
  // The bracket is guaranteed by the algebra (C′ > 0 at D_lower, < 0 at D_upper), so the ends
  // are not evaluated; φ has poles there anyway.
  let t = 0.5 * (lo + hi);
  for (let iter = 0; iter < 200; iter++) {
    evaluateSlope(id, s, x, d, K, farSoon, t);
    const h = slope.value;
    // h is not finite only when a gap underflows to 0 (every discount factor below 1e-308):
    // the criterion is flat zero there and any point of the zone is as good
    if (h === 0 || !Number.isFinite(h)) return t;
    if (h > 0) lo = t;
    else hi = t;
    const dx = h / slope.derivative;
    if (Math.abs(dx) <= 1e-10) {
      // converged: a last Newton step this small may touch the bracket end through rounding
      t = Math.min(hi, Math.max(lo, t - dx));
      evaluateSlope(id, s, x, d, K, farSoon, t);
      return t;
    }
    let next = t - dx;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (hi - lo <= 1e-10) {
      evaluateSlope(id, s, x, d, K, farSoon, next);
      return next;
    }
    t = next;
  }
  throw new Error('optimiseLateDelay: the slope root did not converge in 200 steps');
}

/**
 * φ(D) = (ln C)′ = f1′/A − f2′/B and dφ/dt = φ′(D)·e^t at D = d + e^t, with f1 = f_K(D),
 * f2 = f_K(D − d), A = f1 − x·f_k(d), B = x − f2, so φ′ = f1″/A − (f1′/A)² − f2″/B − (f2′/B)².
 * Inside the zone φ has the sign of C′ (C > 0), so the bracket from C′ carries over.
 */
function evaluateSlope(id: ModelId, s: number, x: number, d: number, K: number, farSoon: number, t: number): void {
  const e = Math.exp(t);
  const D = d + e;
  let f1: number, g1: number, h1: number, f2: number, g2: number, h2: number; // f, f′, f″ at D and at e
  if (id === 'hyperboloid') {
    // f = q^(−s), f′ = −sK·f/q, f″ = s(s + 1)K²·f/q², q = 1 + K·delay
    const q1 = 1 + K * D;
    const q2 = 1 + K * e;
    f1 = Math.pow(q1, -s);
    f2 = Math.pow(q2, -s);
    g1 = (-s * K * f1) / q1;
    g2 = (-s * K * f2) / q2;
    h1 = ((s + 1) * K * -g1) / q1;
    h2 = ((s + 1) * K * -g2) / q2;
  } else {
    // u = K·delay^s, u′ = s·u/delay, u″ = s(s − 1)·u/delay²
    const u1 = K * Math.pow(D, s);
    const u2 = K * Math.exp(s * t);
    const v1 = (s * u1) / D;
    const v2 = (s * u2) / e;
    const w1 = ((s - 1) * v1) / D;
    const w2 = ((s - 1) * v2) / e;
    if (id === 'power-delay') {
      // f = 1/(1 + u), f′ = −u′f², f″ = −u″f² + 2u′²f³
      f1 = 1 / (1 + u1);
      f2 = 1 / (1 + u2);
      g1 = -v1 * f1 * f1;
      g2 = -v2 * f2 * f2;
      h1 = (-w1 + 2 * v1 * v1 * f1) * f1 * f1;
      h2 = (-w2 + 2 * v2 * v2 * f2) * f2 * f2;
    } else {
      // f = e^(−u), f′ = −u′f, f″ = (u′² − u″)f
      f1 = Math.exp(-u1);
      f2 = Math.exp(-u2);
      g1 = -v1 * f1;
      g2 = -v2 * f2;
      h1 = (v1 * v1 - w1) * f1;
      h2 = (v2 * v2 - w2) * f2;
    }
  }
  const far = f1 - farSoon;
  const near = x - f2;
  slope.far = far;
  slope.near = near;
  // Newton runs on the log-derivative φ = (ln C)′ = f1′/A − f2′/B, which has the same root as C′
  // inside the zone but is far closer to linear in t, so few steps are needed
  const ra = g1 / far;
  const rb = g2 / near;
  slope.value = ra - rb;
  slope.derivative = (h1 / far - ra * ra - h2 / near - rb * rb) * e;
}
