import { zeroin } from './findRoot';
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
 *
 * Hyperboloid, power-delay, exponential-power (numerical). C′ > 0 at D_lower (where B = 0,
 * B′ > 0) and C′ < 0 at D_upper (where A = 0, A′ < 0), so C′ = f_K′(D)·B − A·f_K′(D − d)
 * changes sign on the zone: a guaranteed bracket. The root is found with the Brent–Dekker
 * method in t = ln(D − d) to 1e-10 absolute in t, i.e. 1e-10 relative in D. (Brent's
 * function-value maximiser cannot place a smooth maximum better than ~1.5e-8 relative.)
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
  checkPairInput(model, x, d, k, K);
  if (d === 0) return null;
  switch (model.id) {
    case 'hyperbolic':
      return hyperbolicOptimum(x, d, k, K);
    case 'exponential':
      return presentBiasOptimum(x, d, k, K, 1);
    case 'quasi-hyperbolic':
      return presentBiasOptimum(x, d, k, K, model.presentBias ?? 1);
    default:
      return numericalOptimum(model.id, model.sensitivity ?? 1, x, d, k, K);
  }
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
  let lateDelay: number;
  let nearFactor: number; // f_K(D − d) just right of d
  if (a > 0) {
    // β > x, so non-emptiness forces y < 0; D* − D_lower = −ln(1 + expm1(y)/2)/K has no cancellation
    lateDelay = lower - Math.log1p(0.5 * Math.expm1(y)) / K;
    nearFactor = beta * Math.exp(-K * (lateDelay - d));
  } else {
    const log1pEy = y > 0 ? y + Math.log1p(Math.exp(-y)) : Math.log1p(Math.exp(y));
    lateDelay = d + (Math.LN2 + lnBeta + lnR - log1pEy) / K;
    if (lateDelay > d) {
      nearFactor = beta * Math.exp(-K * (lateDelay - d));
    } else {
      lateDelay = d; // the zone starts at d and C is largest as D → d⁺
      nearFactor = beta;
    }
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
  const slope = (t: number): number => gapSlope(id, s, x, d, K, farSoon, t);
  const gLow = slope(tLow);
  const gHigh = slope(tHigh);
  let t: number;
  if (!(gLow > 0)) t = tLow; // zone narrower than rounding: the ends are the answer
  else if (!(gHigh < 0)) t = tHigh;
  else t = zeroin(slope, tLow, tHigh, gLow, gHigh, 1e-10, 100);
  if (Number.isNaN(t)) throw new Error('optimiseLateDelay: root finder did not converge');
  const lateDelay = d + Math.exp(t);
  const far = factor(id, s, K, lateDelay) - farSoon;
  const near = x - factor(id, s, K, lateDelay - d);
  return { lower, upper, lateDelay, gapProduct: far * near };
}

function factor(id: ModelId, s: number, K: number, D: number): number {
  if (id === 'hyperboloid') return Math.pow(1 + K * D, -s);
  if (id === 'power-delay') return 1 / (1 + K * Math.pow(D, s));
  return Math.exp(-K * Math.pow(D, s));
}

/** Sign-carrying dC/dD at D = d + e^t, divided by the positive constant s·K. */
function gapSlope(id: ModelId, s: number, x: number, d: number, K: number, farSoon: number, t: number): number {
  const e = Math.exp(t);
  const D = d + e;
  let f1: number, g1: number, f2: number, g2: number; // factor and −slope/(sK) at D and at e
  if (id === 'hyperboloid') {
    const q1 = 1 + K * D;
    const q2 = 1 + K * e;
    f1 = Math.pow(q1, -s);
    f2 = Math.pow(q2, -s);
    g1 = f1 / q1;
    g2 = f2 / q2;
  } else if (id === 'power-delay') {
    const D1s = Math.pow(D, s);
    const D2s = Math.exp(s * t);
    f1 = 1 / (1 + K * D1s);
    f2 = 1 / (1 + K * D2s);
    g1 = (D1s / D) * f1 * f1;
    g2 = (D2s / e) * f2 * f2;
  } else {
    const D1s = Math.pow(D, s);
    const D2s = Math.exp(s * t);
    f1 = Math.exp(-K * D1s);
    f2 = Math.exp(-K * D2s);
    g1 = (D1s / D) * f1;
    g2 = (D2s / e) * f2;
  }
  // C′ = f1′·B − A·f2′ with f′ = −sK·g
  return -g1 * (x - f2) + (f1 - farSoon) * g2;
}
